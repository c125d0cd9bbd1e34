/**
 * The bench's signing key: an Ed25519 key pair (RFC 8032, node:crypto) made on the first export and kept in the
 * data folder as `bench-signing-key.pem` (PKCS #8, readable by its owner only). An archive signed with it carries
 * the public key; its fingerprint (the first 16 hex digits of the public key's sha-256) is what a technician
 * compares with the one the exporting bench shows (`rampwright export` prints it).
 */
import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync, sign, verify, type KeyObject } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { homedir } from 'node:os';
import { dirname, join } from 'node:path';
import { InputError } from '../../app/errors';
import { userDataFolder } from '../session/dataFolder';

export const benchKeyFileName = 'bench-signing-key.pem';

export interface BenchKey {
  privateKey: KeyObject;
  /** The raw 32-byte public key. */
  publicKey: Buffer;
  fingerprint: string;
}

export function defaultBenchKeyPath(): string {
  return join(userDataFolder({ platform: process.platform, env: process.env, home: homedir() }), benchKeyFileName);
}

/** `3f9a 12c4 77de 01b2`: the first 64 bits of the public key's sha-256, in groups a person can read out. */
export function keyFingerprint(publicKey: Uint8Array): string {
  const hex = createHash('sha256').update(publicKey).digest('hex').slice(0, 16);
  return hex.match(/.{4}/g)?.join(' ') ?? hex;
}

function rawPublicKey(key: KeyObject): Buffer {
  const jwk = createPublicKey(key).export({ format: 'jwk' }) as { x?: string };
  if (!jwk.x) throw new Error('an Ed25519 public key without its x coordinate');
  return Buffer.from(jwk.x, 'base64url');
}

/** The key at `path`, made there (mode 0600) when there is none yet. */
export function loadOrCreateBenchKey(path = defaultBenchKeyPath()): BenchKey {
  let privateKey: KeyObject;
  if (existsSync(path)) {
    try {
      privateKey = createPrivateKey(readFileSync(path));
    } catch (error) {
      throw new InputError(`is not a bench signing key (${error instanceof Error ? error.message : String(error)})`, path);
    }
    if (privateKey.asymmetricKeyType !== 'ed25519') throw new InputError(`is a ${privateKey.asymmetricKeyType} key; a bench signs with Ed25519`, path);
  } else {
    ({ privateKey } = generateKeyPairSync('ed25519'));
    try {
      mkdirSync(dirname(path), { recursive: true });
      writeFileSync(path, privateKey.export({ format: 'pem', type: 'pkcs8' }), { mode: 0o600 });
      chmodSync(path, 0o600);
    } catch (error) {
      throw new InputError(`cannot keep the bench signing key here (${error instanceof Error ? error.message : String(error)})`, path);
    }
  }
  const publicKey = rawPublicKey(privateKey);
  return { privateKey, publicKey, fingerprint: keyFingerprint(publicKey) };
}

export function signBytes(key: BenchKey, message: Uint8Array): Buffer {
  return sign(null, message, key.privateKey);
}

/** True when `signature` is `publicKey`'s Ed25519 signature of `message`; false for any malformed key or signature. */
export function signatureHolds(publicKey: Uint8Array, message: Uint8Array, signature: Uint8Array): boolean {
  if (publicKey.length !== 32 || signature.length !== 64) return false;
  try {
    const key = createPublicKey({ key: { kty: 'OKP', crv: 'Ed25519', x: Buffer.from(publicKey).toString('base64url') }, format: 'jwk' });
    return verify(null, message, key, signature);
  } catch {
    return false;
  }
}
