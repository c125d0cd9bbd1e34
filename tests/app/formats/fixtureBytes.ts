/** Reads a capture fixture as the bytes a reader would be fed. */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

export const captureFixtureFolder = fileURLToPath(new URL('../../../fixtures/captures/', import.meta.url));

export function fixtureBytes(name: string): Uint8Array {
  return new Uint8Array(readFileSync(captureFixtureFolder + name));
}

export function fixtureText(name: string): string {
  return readFileSync(captureFixtureFolder + name, 'utf8');
}
