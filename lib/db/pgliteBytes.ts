// pglite-prisma-adapter 0.6.1 predates Prisma 6.19's way of passing Bytes arguments
// (base64 text tagged scalarType "bytes"), and PGlite only accepts a Uint8Array for a
// bytea parameter. This decodes such arguments before every PGlite query, the same
// mapping @prisma/adapter-pg does for the server. Applied once, on the adapter's shared
// query class, so transactions get it too.
import { PrismaPGlite } from "pglite-prisma-adapter";

interface ArgType {
  scalarType?: string;
  arity?: string;
}
interface SqlQuery {
  sql: string;
  args: unknown[];
  argTypes?: ArgType[];
}

function toBytes(arg: unknown, type: ArgType | undefined): unknown {
  if (type?.scalarType !== "bytes" || arg === null || arg === undefined) return arg;
  if (typeof arg === "string") return new Uint8Array(Buffer.from(arg, "base64"));
  if (Array.isArray(arg) && type.arity !== "list") return Uint8Array.from(arg as number[]);
  if (Array.isArray(arg)) return arg.map((item) => toBytes(item, { scalarType: "bytes" }));
  if (ArrayBuffer.isView(arg)) return new Uint8Array(arg.buffer, arg.byteOffset, arg.byteLength);
  return arg;
}

let patched = false;

export async function patchPgliteBytes(): Promise<void> {
  if (patched) return;
  const probe = await new PrismaPGlite({} as never).connect();
  const queryable = Object.getPrototypeOf(Object.getPrototypeOf(probe)) as {
    performIO: (this: unknown, query: SqlQuery) => Promise<unknown>;
  };
  const original = queryable.performIO;
  if (typeof original !== "function") throw new Error("pglite-prisma-adapter changed shape: performIO not found");
  queryable.performIO = function (this: unknown, query: SqlQuery) {
    const args = query.args.map((arg, i) => toBytes(arg, query.argTypes?.[i]));
    return original.call(this, { ...query, args });
  };
  patched = true;
}
