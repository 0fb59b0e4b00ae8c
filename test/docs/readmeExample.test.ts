import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { join } from "node:path";

const root = fileURLToPath(new URL("../..", import.meta.url));

/** The TypeScript block that follows the `<!-- library-example -->` marker in README.md. */
function readmeExample(): string {
  const readme = readFileSync(join(root, "README.md"), "utf8");
  const m = readme.match(/<!-- library-example -->\s*```ts\n([\s\S]*?)```/);
  if (!m) throw new Error("README.md has no ```ts block after <!-- library-example -->");
  return m[1];
}

describe("README library example", () => {
  it("type-checks against @chirpsieve/core's published types and runs, printing candidates", () => {
    const dir = join(root, "test", ".readme-example");
    rmSync(dir, { recursive: true, force: true });
    mkdirSync(dir, { recursive: true });
    try {
      writeFileSync(join(dir, "example.ts"), readmeExample());
      writeFileSync(
        join(dir, "tsconfig.json"),
        JSON.stringify({
          extends: "../../tsconfig.base.json",
          compilerOptions: { rootDir: ".", outDir: "out", composite: false, declaration: false, declarationMap: false },
          include: ["example.ts"],
        }),
      );
      writeFileSync(join(dir, "package.json"), JSON.stringify({ type: "module" }));
      const tsc = spawnSync(process.execPath, [join(root, "node_modules", "typescript", "bin", "tsc"), "-p", dir], { encoding: "utf8" });
      expect(tsc.stdout + tsc.stderr).toBe("");
      expect(tsc.status).toBe(0);
      const run = spawnSync(process.execPath, [join(dir, "out", "example.js")], { cwd: root, encoding: "utf8", timeout: 120_000 });
      expect(run.stderr).toBe("");
      expect(run.status).toBe(0);
      // The shipped synthetic data holds two injected chirps; the example prints one line each.
      expect(run.stdout.trim().split("\n").length).toBeGreaterThanOrEqual(2);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
