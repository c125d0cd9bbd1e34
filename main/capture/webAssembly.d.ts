/**
 * The few WebAssembly globals the CSV parser threads use (csvFieldsWasm.ts): Node has them, but the ES2022 library
 * and Node's types of this version do not declare them (the DOM library does, and main/ has none).
 */
declare namespace WebAssembly {
  class Module {
    constructor(bytes: BufferSource);
  }
  class Memory {
    constructor(descriptor: { initial: number; maximum?: number });
    readonly buffer: ArrayBuffer;
    grow(pages: number): number;
  }
  class Instance {
    constructor(module: Module, imports?: Record<string, Record<string, unknown>>);
    readonly exports: Record<string, unknown>;
  }
}
