import { describe, expect, it } from "vitest";
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";

// lib/radio is the pure core (DESIGN.md §4): no framework, database or Node I/O imports.
describe("lib/radio imports", () => {
  it("every lib/radio module imports only relative lib/radio modules", () => {
    const dir = path.join(process.cwd(), "lib/radio");
    for (const file of readdirSync(dir).filter((f) => f.endsWith(".ts"))) {
      const source = readFileSync(path.join(dir, file), "utf8");
      for (const m of source.matchAll(/(?:import|export)[^"']*from\s+["']([^"']+)["']/g)) {
        expect(m[1], `${file} imports ${m[1]}`).toMatch(/^\.\/[A-Za-z0-9]+$/);
      }
      expect(source, file).not.toMatch(/\brequire\(|import\(/);
    }
  });
});
