/**
 * A small WebAssembly assembler for edgewise's hand-written kernels (the inner loops of the exact
 * evaluator), so that they get native 64-bit masks, popcnt and ctz without any toolchain: the
 * module is assembled in memory in well under a millisecond.
 *
 * Kernels are written as trees of Code (bytes, nested arrays, and structured control with named
 * labels); `fn` declares a function with named parameters and locals, `module` encodes a module
 * importing one memory ("env", "memory") and exporting its functions. Only the instructions the
 * kernels use are here (WebAssembly core specification 1.0, binary format, from memory; every
 * kernel is checked against plain reference code in the tests).
 */

export type ValType = 'i32' | 'i64' | 'f64';
const TYPE_BYTE: Record<ValType, number> = { i32: 0x7f, i64: 0x7e, f64: 0x7c };

/** A piece of code: bytes, sequences, or structured control flow resolved at encoding time. */
export type Code = number | readonly Code[] | Control | Branch;
interface Control {
  readonly kind: 'block' | 'loop' | 'if';
  readonly label: string;
  readonly body: readonly Code[];
  readonly orElse?: readonly Code[];
}
interface Branch {
  readonly kind: 'br';
  readonly label: string;
  /** 0x0c br, 0x0d br_if */
  readonly op: number;
}

function uleb(v: number | bigint, out: number[]): void {
  let x = BigInt(v);
  do {
    let b = Number(x & 0x7fn);
    x >>= 7n;
    if (x !== 0n) b |= 0x80;
    out.push(b);
  } while (x !== 0n);
}

function sleb(v: number | bigint, out: number[]): void {
  let x = BigInt(v);
  for (;;) {
    const b = Number(x & 0x7fn);
    x >>= 7n;
    if ((x === 0n && (b & 0x40) === 0) || (x === -1n && (b & 0x40) !== 0)) {
      out.push(b);
      return;
    }
    out.push(b | 0x80);
  }
}

function encode(code: Code, labels: string[], out: number[]): void {
  if (typeof code === 'number') {
    out.push(code);
    return;
  }
  if (Array.isArray(code)) {
    for (const c of code as readonly Code[]) encode(c, labels, out);
    return;
  }
  const c = code as Control | Branch;
  if (c.kind === 'br') {
    const depth = labels.lastIndexOf(c.label);
    if (depth < 0) throw new Error(`wasm assembler: no enclosing label ${c.label}`);
    out.push(c.op);
    uleb(labels.length - 1 - depth, out);
    return;
  }
  out.push(c.kind === 'block' ? 0x02 : c.kind === 'loop' ? 0x03 : 0x04, 0x40);
  labels.push(c.label);
  for (const x of c.body) encode(x, labels, out);
  if (c.orElse) {
    out.push(0x05);
    for (const x of c.orElse) encode(x, labels, out);
  }
  labels.pop();
  out.push(0x0b);
}

/** `block` (a br to its label jumps past the end), `loop` (a br jumps back to the start). */
export const block = (label: string, ...body: Code[]): Code => ({ kind: 'block', label, body });
export const loop = (label: string, ...body: Code[]): Code => ({ kind: 'loop', label, body });
/** if (cond is an i32 on the stack first) … else … end, with no result. */
export const when = (cond: Code, then: Code[], orElse?: Code[]): Code => [cond, { kind: 'if', label: '', body: then, ...(orElse ? { orElse } : {}) }];
export const br = (label: string): Code => ({ kind: 'br', label, op: 0x0c });
export const brIf = (label: string, cond: Code): Code => [cond, { kind: 'br', label, op: 0x0d }];
export const ret = (value?: Code): Code => (value === undefined ? 0x0f : [value, 0x0f]);

const op1 = (opcode: number) => (a: Code): Code => [a, opcode];
const op2 = (opcode: number) => (a: Code, b: Code): Code => [a, b, opcode];
const memarg = (align: number, offset: number): number[] => {
  const out = [align];
  uleb(offset, out);
  return out;
};
const load = (opcode: number, align: number) => (addr: Code, offset = 0): Code => [addr, opcode, ...memarg(align, offset)];
const store = (opcode: number, align: number) => (addr: Code, value: Code, offset = 0): Code => [addr, value, opcode, ...memarg(align, offset)];

export const i32 = {
  const: (v: number): Code => {
    const out = [0x41];
    sleb(v | 0, out);
    return out;
  },
  load: load(0x28, 2),
  store: store(0x36, 2),
  eqz: op1(0x45),
  eq: op2(0x46),
  ne: op2(0x47),
  lt_s: op2(0x48),
  gt_s: op2(0x4a),
  le_s: op2(0x4c),
  ge_s: op2(0x4e),
  add: op2(0x6a),
  sub: op2(0x6b),
  mul: op2(0x6c),
  and: op2(0x71),
  or: op2(0x72),
  shl: op2(0x74),
  shr_u: op2(0x76),
  ctz: op1(0x68),
  wrap: op1(0xa7),
};

export const i64 = {
  const: (v: bigint | number): Code => {
    const out = [0x42];
    sleb(v, out);
    return out;
  },
  /** 64-bit load; align 2 (4 bytes) allows the masks stored inside Int32 records */
  load: load(0x29, 2),
  store: store(0x37, 3),
  eqz: op1(0x50),
  ne: op2(0x52),
  ctz: op1(0x7a),
  clz: op1(0x79),
  popcnt: op1(0x7b),
  add: op2(0x7c),
  sub: op2(0x7d),
  and: op2(0x83),
  or: op2(0x84),
  xor: op2(0x85),
  shl: op2(0x86),
  shr_u: op2(0x88),
  extend_u: op1(0xad),
};

export const f64 = {
  const: (v: number): Code => {
    const bytes = new Uint8Array(new Float64Array([v]).buffer);
    return [0x44, ...bytes];
  },
  load: load(0x2b, 3),
  store: store(0x39, 3),
  gt: op2(0x64),
  convert_i32_u: op1(0xb8),
  add: op2(0xa0),
  sub: op2(0xa1),
  mul: op2(0xa2),
  div: op2(0xa3),
};

/** A function under construction: named parameters and locals, then a body. */
export class Fn {
  private readonly index = new Map<string, number>();
  private readonly types: ValType[] = [];
  private readonly nParams: number;
  private body: readonly Code[] = [];

  constructor(
    readonly name: string,
    params: Readonly<Record<string, ValType>>,
    readonly result?: ValType,
  ) {
    for (const [k, t] of Object.entries(params)) this.add(k, t);
    this.nParams = this.types.length;
  }

  /** Declares locals (name → type). */
  locals(decl: Readonly<Record<string, ValType>>): this {
    for (const [k, t] of Object.entries(decl)) this.add(k, t);
    return this;
  }

  private add(name: string, t: ValType): void {
    if (this.index.has(name)) throw new Error(`wasm assembler: ${this.name} declares ${name} twice`);
    this.index.set(name, this.types.length);
    this.types.push(t);
  }

  private at(name: string): number[] {
    const i = this.index.get(name);
    if (i === undefined) throw new Error(`wasm assembler: ${this.name} has no local ${name}`);
    const out: number[] = [];
    uleb(i, out);
    return out;
  }

  readonly get = (name: string): Code => [0x20, ...this.at(name)];
  readonly set = (name: string, value: Code): Code => [value, 0x21, ...this.at(name)];
  readonly tee = (name: string, value: Code): Code => [value, 0x22, ...this.at(name)];

  define(...body: Code[]): this {
    this.body = body;
    return this;
  }

  /** Type section entry. */
  signature(): number[] {
    const out = [0x60];
    uleb(this.nParams, out);
    for (let i = 0; i < this.nParams; i++) out.push(TYPE_BYTE[this.types[i]!]);
    if (this.result) out.push(1, TYPE_BYTE[this.result]);
    else out.push(0);
    return out;
  }

  /** Code section entry (size-prefixed). */
  code(): number[] {
    const inner: number[] = [];
    const locals = this.types.slice(this.nParams);
    uleb(locals.length, inner);
    for (const t of locals) inner.push(1, TYPE_BYTE[t]);
    encode(this.body, [], inner);
    inner.push(0x0b);
    const out: number[] = [];
    uleb(inner.length, out);
    return out.concat(inner);
  }
}

function section(id: number, payload: number[]): number[] {
  const out = [id];
  uleb(payload.length, out);
  return out.concat(payload);
}

function name(s: string, out: number[]): void {
  const b = new TextEncoder().encode(s);
  uleb(b.length, out);
  out.push(...b);
}

/** The binary of a module that imports env.memory and exports `fns` by name. */
export function module(fns: readonly Fn[]): Uint8Array {
  const types: number[] = [];
  uleb(fns.length, types);
  for (const f of fns) types.push(...f.signature());
  const imports: number[] = [1];
  name('env', imports);
  name('memory', imports);
  imports.push(0x02, 0x00, 0x00); // memory, limits: min 0, no max
  const funcs: number[] = [];
  uleb(fns.length, funcs);
  fns.forEach((_, i) => uleb(i, funcs));
  const exports: number[] = [];
  uleb(fns.length, exports);
  fns.forEach((f, i) => {
    name(f.name, exports);
    exports.push(0x00);
    uleb(i, exports);
  });
  const codes: number[] = [];
  uleb(fns.length, codes);
  for (const f of fns) codes.push(...f.code());
  return Uint8Array.from([
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, types),
    ...section(2, imports),
    ...section(3, funcs),
    ...section(7, exports),
    ...section(10, codes),
  ]);
}
