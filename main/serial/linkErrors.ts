/**
 * Why a serial device cannot be opened, in words a technician can act on. `LinkError` is an `InputError`, so the
 * command line prints it and exits 2. The native binding only gives a message string, so the kind is read from it
 * (messages of @serialport/bindings-cpp: "No such file or directory, cannot open", "Cannot lock port",
 * "Permission denied, cannot open", "Inappropriate ioctl for device"); a stat of the path beforehand catches the
 * common cases with an errno instead.
 */
import { statSync } from 'node:fs';
import { InputError } from '../../app/errors';

export type LinkErrorKind = 'not-found' | 'busy' | 'permission-denied' | 'not-a-serial-device' | 'bad-path' | 'not-open' | 'io';

export class LinkError extends InputError {
  readonly kind: LinkErrorKind;
  readonly path: string;
  /** The message without the device in front. */
  readonly detail: string;

  constructor(kind: LinkErrorKind, path: string, message: string) {
    super(message, path === '' ? 'serial port' : path);
    this.name = 'LinkError';
    this.kind = kind;
    this.path = path;
    this.detail = message;
  }
}

export interface PlatformFacts {
  platform: NodeJS.Platform;
}

function permissionHint(path: string, facts: PlatformFacts): string {
  if (facts.platform === 'linux') {
    return `permission denied: your user may not use ${path}. Join the group that owns it (usually "dialout": sudo usermod -aG dialout $USER), then log out and in again`;
  }
  if (facts.platform === 'darwin') return `permission denied on ${path}: check the device's permissions (ls -l ${path})`;
  return `permission denied on ${path}: another program may hold it, or your account lacks access`;
}

export function linkErrorFromMessage(path: string, message: string, facts: PlatformFacts = { platform: process.platform }): LinkError {
  const text = message.toLowerCase();
  if (text.includes('no such file') || text.includes('enoent') || text.includes('file not found') || text.includes('cannot find')) {
    return new LinkError('not-found', path, 'no such serial device: is the logger plugged in?');
  }
  if (text.includes('cannot lock') || text.includes('resource temporarily unavailable') || text.includes('busy') || text.includes('access denied')) {
    return new LinkError('busy', path, 'the serial device is busy: another program (a terminal, another Rampwright) has it open; close that program and try again');
  }
  if (text.includes('permission denied') || text.includes('eacces') || text.includes('eperm')) {
    return new LinkError('permission-denied', path, permissionHint(path, facts));
  }
  if (text.includes('inappropriate ioctl') || text.includes('not a typewriter') || text.includes('enotty')) {
    return new LinkError('not-a-serial-device', path, 'this is not a serial device (a plain file?): give the logger port, e.g. /dev/ttyACM0 or COM3');
  }
  if (text.includes('is a directory')) return new LinkError('bad-path', path, 'this is a folder, not a serial device');
  return new LinkError('io', path, `cannot use the serial device: ${message}`);
}

/** Checks a device path before handing it to the native binding (which reports less clearly). */
export function checkDevicePath(path: string, facts: PlatformFacts = { platform: process.platform }): void {
  if (typeof path !== 'string' || path.trim() === '') throw new LinkError('bad-path', '', 'no serial device given: name the logger port, e.g. /dev/ttyACM0 or COM3');
  if (path.includes('\u0000')) throw new LinkError('bad-path', path.replace(/\u0000/g, '\\0'), 'a device path cannot contain a NUL character');
  if (facts.platform === 'win32') return; // COM ports are not files to stat
  let stats;
  try {
    stats = statSync(path);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'ENOTDIR') throw linkErrorFromMessage(path, 'no such file', facts);
    if (code === 'EACCES' || code === 'EPERM') throw linkErrorFromMessage(path, 'permission denied', facts);
    throw new LinkError('bad-path', path, `cannot look at this path: ${(error as Error).message}`);
  }
  if (stats.isDirectory()) throw linkErrorFromMessage(path, 'is a directory', facts);
  if (!stats.isCharacterDevice()) throw linkErrorFromMessage(path, 'inappropriate ioctl', facts);
}
