/**
 * The contract calls for capture files opened on the screens: pieces in, a first look and the roles, the roles
 * remembered with the design. Opening the capture as the link is `connect` with kind 'capture' (sessionService).
 */
import { parseChannelMap } from '../../app/capture/channelMap';
import { BenchFault } from '../../app/contract';
import { captureUploadPieceBytes } from '../../app/contract/captureImport';
import type { BenchHandlers } from './handlers';
import type { CaptureUploads } from './captureUploads';
import { inspectUploadedCapture } from './captureInspect';
import type { DesignCatalog } from './designCatalog';

type CaptureHandlers = Pick<BenchHandlers, 'captureUploadStart' | 'captureUploadChunk' | 'inspectCapture' | 'saveCaptureMap'>;

export function createCaptureHandlers(options: { uploads: CaptureUploads; designs: DesignCatalog }): CaptureHandlers {
  const { uploads, designs } = options;
  return {
    async captureUploadStart({ files }) {
      if (files.some((file) => file.sizeBytes === 0)) throw new BenchFault('input', 'the file is empty', 'files');
      const upload = uploads.start(files);
      return { uploadId: upload.id, pieceBytes: captureUploadPieceBytes };
    },
    async captureUploadChunk({ uploadId, fileIndex, offset, contentBase64 }) {
      const bytes = Buffer.from(contentBase64, 'base64');
      if (bytes.length > captureUploadPieceBytes) throw new BenchFault('input', `a piece holds at most ${captureUploadPieceBytes} bytes`, 'contentBase64');
      const receivedBytes = await uploads.write(uploadId, fileIndex, offset, new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.length));
      return { receivedBytes };
    },
    async inspectCapture({ uploadId, designName, fields }) {
      const design = designName ? (await designs.get(designName)).design : null;
      return inspectUploadedCapture(uploads.get(uploadId), fields, design);
    },
    async saveCaptureMap({ designName, channelMap }) {
      const stored = await designs.get(designName);
      const map = parseChannelMap(channelMap, 'the roles');
      return designs.save({ ...stored.design, channelMap: map });
    },
  };
}
