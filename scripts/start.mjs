// `npm start`: the desktop app when Electron's binary is installed; otherwise browser mode (the same screens
// served on 127.0.0.1 with the virtual board connected), with a line saying why.
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

/** The Electron binary's path when the package and its download are both there, else null. */
export function electronBinary() {
  try {
    const binary = require('electron');
    return typeof binary === 'string' && existsSync(binary) ? binary : null;
  } catch {
    return null;
  }
}

function run(command, args) {
  const child = spawn(command, args, { stdio: 'inherit' });
  const forward = (signal) => child.kill(signal);
  process.on('SIGINT', forward);
  process.on('SIGTERM', forward);
  child.on('exit', (code, signal) => process.exit(signal ? 1 : (code ?? 0)));
}

if (!existsSync('dist/rampwright.js') || !existsSync('dist/electron/main.js')) {
  process.stderr.write('Rampwright is not built yet: run npm install (or npm run build) first.\n');
  process.exit(2);
}

const binary = electronBinary();
if (binary) {
  run(binary, ['.']);
} else {
  process.stdout.write('The Electron binary is not installed here, so Rampwright starts in browser mode: open the address below.\n');
  run(process.execPath, ['dist/rampwright.js', 'serve', '--demo', ...process.argv.slice(2)]);
}
