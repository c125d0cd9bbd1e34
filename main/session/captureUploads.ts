/**
 * Capture files sent from the screens, piece by piece, into a private temporary folder (one per service), so they
 * can be read like files on disk (streaming, threads, COMTRADE pairs side by side). Pieces must come in order; a
 * new upload replaces an older one beyond a few; everything is removed when the service closes.
 */
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { mkdir, open, type FileHandle } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { extname, join } from 'node:path';
import { BenchFault } from '../../app/contract';

export interface CaptureUpload {
  id: string;
  folder: string;
  files: { name: string; path: string; sizeBytes: number; receivedBytes: number }[];
  /** The file to open: the .csv, the .cff, or the .cfg of a pair. */
  mainPath: string;
  complete(): boolean;
}

/** Uploads kept at once (the newest); an older one is dropped with its files. */
const keptUploads = 3;

export interface CaptureUploads {
  start(files: { name: string; sizeBytes: number }[]): CaptureUpload;
  write(id: string, fileIndex: number, offset: number, bytes: Uint8Array): Promise<number>;
  get(id: string): CaptureUpload;
  close(): void;
}

function checkPairing(names: string[]): void {
  const extensions = names.map((name) => extname(name).toLowerCase());
  if (names.length === 1) {
    if (extensions[0] === '.cfg' || extensions[0] === '.dat') throw new BenchFault('input', 'a COMTRADE record needs both its .cfg and its .dat: choose the two files together', 'files');
    return;
  }
  const sorted = [...extensions].sort().join(' ');
  if (sorted !== '.cfg .dat') throw new BenchFault('input', 'two files make a capture only as a COMTRADE .cfg with its .dat', 'files');
}

export function createCaptureUploads(): CaptureUploads {
  let root: string | null = null;
  const uploads = new Map<string, CaptureUpload>();
  const handles = new Map<string, FileHandle>();

  const folderFor = (id: string): string => {
    root ??= mkdtempSync(join(tmpdir(), 'rampwright-captures-'));
    return join(root, id);
  };

  const drop = (id: string): void => {
    const upload = uploads.get(id);
    uploads.delete(id);
    for (const [key, handle] of handles) {
      if (key.startsWith(`${id}/`)) {
        void handle.close().catch(() => undefined);
        handles.delete(key);
      }
    }
    if (upload) rmSync(upload.folder, { recursive: true, force: true });
  };

  return {
    start(files) {
      checkPairing(files.map((file) => file.name));
      const id = randomBytes(12).toString('hex');
      const folder = folderFor(id);
      const entries = files.map((file) => ({ name: file.name, path: join(folder, file.name), sizeBytes: file.sizeBytes, receivedBytes: 0 }));
      const main = entries.find((entry) => extname(entry.name).toLowerCase() !== '.dat') ?? entries[0];
      const upload: CaptureUpload = { id, folder, files: entries, mainPath: main.path, complete: () => entries.every((entry) => entry.receivedBytes === entry.sizeBytes) };
      uploads.set(id, upload);
      while (uploads.size > keptUploads) drop(uploads.keys().next().value as string);
      return upload;
    },
    async write(id, fileIndex, offset, bytes) {
      const upload = uploads.get(id);
      if (!upload) throw new BenchFault('not-found', 'that upload is no longer here (a newer one replaced it): send the file again', 'uploadId');
      const file = upload.files[fileIndex];
      if (!file) throw new BenchFault('input', `the upload has no file ${fileIndex}`, 'fileIndex');
      if (offset !== file.receivedBytes) throw new BenchFault('input', `pieces must come in order: expected offset ${file.receivedBytes}, got ${offset}`, 'offset');
      if (file.receivedBytes + bytes.length > file.sizeBytes) throw new BenchFault('input', `${file.name} is longer than the ${file.sizeBytes} bytes announced`, 'contentBase64');
      const key = `${id}/${fileIndex}`;
      let handle = handles.get(key);
      if (!handle) {
        await mkdir(upload.folder, { recursive: true });
        handle = await open(file.path, offset === 0 ? 'w' : 'a');
        handles.set(key, handle);
      }
      await handle.write(bytes, 0, bytes.length, offset);
      file.receivedBytes += bytes.length;
      if (file.receivedBytes === file.sizeBytes) {
        await handle.close();
        handles.delete(key);
      }
      return file.receivedBytes;
    },
    get(id) {
      const upload = uploads.get(id);
      if (!upload) throw new BenchFault('not-found', 'that upload is no longer here (a newer one replaced it): send the file again', 'uploadId');
      if (!upload.complete()) throw new BenchFault('not-ready', 'the file has not arrived whole yet', 'uploadId');
      return upload;
    },
    close() {
      for (const id of [...uploads.keys()]) drop(id);
      if (root) rmSync(root, { recursive: true, force: true });
      root = null;
    },
  };
}
