/**
 * The name a bench records its sessions under, so a shared logbook shows which bench did each session: the
 * RAMPWRIGHT_BENCH setting (or `--bench`), else the computer's host name.
 */
import { hostname } from 'node:os';

export function benchName(env: Record<string, string | undefined> = process.env): string {
  const named = env.RAMPWRIGHT_BENCH?.trim();
  return named && named !== '' ? named : hostname();
}
