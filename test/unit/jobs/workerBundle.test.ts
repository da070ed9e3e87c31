import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { execFileSync } from "node:child_process";
import { afterAll, describe, expect, it } from "vitest";
import { ensureWorkerBundle, workerBundleIsFresh } from "../../../lib/jobs/workerBundle";

const esbuild = path.join(process.cwd(), "node_modules/esbuild/bin/esbuild");
const root = fs.mkdtempSync(path.join(os.tmpdir(), "beamgate-bundle-"));
afterAll(() => fs.rmSync(root, { recursive: true, force: true }));

function write(relative: string, text: string) {
  fs.mkdirSync(path.dirname(path.join(root, relative)), { recursive: true });
  fs.writeFileSync(path.join(root, relative), text);
}

describe("ensureWorkerBundle", () => {
  write("src/entry.ts", 'import { answer } from "./dep";\nconst n: number = answer();\nconsole.log(`answer ${n}`);\n');
  write("src/dep.ts", "export function answer(): number {\n  return 42;\n}\n");
  const options = { root, entry: "src/entry.ts", outFile: "out/entry.mjs", esbuild };

  it("ensureWorkerBundle bundles the entry and its imports into one module that plain node runs (no tsx)", async () => {
    const bundle = await ensureWorkerBundle(options);
    expect(bundle).toEqual({ file: path.join(root, "out/entry.mjs"), rebuilt: true });
    expect(execFileSync(process.execPath, [bundle.file], { encoding: "utf8" })).toBe("answer 42\n");
    const meta = JSON.parse(fs.readFileSync(path.join(root, "out/entry.meta.json"), "utf8"));
    expect(Object.keys(meta.inputs).sort()).toEqual(["src/dep.ts", "src/entry.ts"]);
    expect(fs.readdirSync(path.join(root, "out")).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });

  it("ensureWorkerBundle keeps a bundle newer than its inputs and rebuilds after an import changes", async () => {
    expect((await ensureWorkerBundle(options)).rebuilt).toBe(false);
    write("src/dep.ts", "export function answer(): number {\n  return 43;\n}\n");
    const later = new Date(Date.now() + 5000);
    fs.utimesSync(path.join(root, "src/dep.ts"), later, later);
    expect(await workerBundleIsFresh(root, "src/entry.ts", path.join(root, "out/entry.mjs"))).toBe(false);
    const again = await ensureWorkerBundle(options);
    expect(again.rebuilt).toBe(true);
    expect(execFileSync(process.execPath, [again.file], { encoding: "utf8" })).toBe("answer 43\n");
  });

  it("ensureWorkerBundle shares one build between concurrent calls", async () => {
    fs.rmSync(path.join(root, "out"), { recursive: true, force: true });
    const [a, b] = await Promise.all([ensureWorkerBundle(options), ensureWorkerBundle(options)]);
    expect(a).toBe(b);
  });

  it("ensureWorkerBundle rejects naming the esbuild executable when the entry does not compile", async () => {
    write("src/broken.ts", "import { nothing } from './missing';\nconsole.log(nothing);\n");
    await expect(ensureWorkerBundle({ ...options, entry: "src/broken.ts", outFile: "out/broken.mjs" })).rejects.toThrow(/bundling the simulation worker failed .*esbuild.*missing/s);
  });
});
