/**
 * The part of the WebAssembly JavaScript interface that edgewise uses (Node has it as a global; the
 * project's lib setting has no DOM types, where TypeScript declares it).
 */
declare namespace WebAssembly {
  class Module {
    constructor(bytes: Uint8Array);
  }
  class Memory {
    constructor(descriptor: { initial: number; maximum?: number });
    readonly buffer: ArrayBuffer;
  }
  class Instance {
    constructor(module: Module, imports: Record<string, Record<string, unknown>>);
    readonly exports: Record<string, unknown>;
  }
}
