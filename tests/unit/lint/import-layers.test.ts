import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { ESLint } from "eslint";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

// The project's own eslint.config.mjs, run through ESLint's Node API on small probe sources.
// Wrong-way imports are linted as in-memory text at a path inside the layer; the cycle needs two
// files on disk (the cycle rule reads the imported file), written to a temporary folder and removed.
const root = path.resolve(fileURLToPath(new URL("../../..", import.meta.url)));
const eslint = new ESLint({ cwd: root });

const layerRules = new Set([
  "import-x/no-restricted-paths",
  "import-x/no-cycle",
  "@typescript-eslint/no-restricted-imports",
]);

async function layerErrors(code: string, relativePath: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: path.join(root, relativePath) });
  return result.messages.filter((m) => m.ruleId !== null && layerRules.has(m.ruleId)).map((m) => m.ruleId as string);
}

describe("import layers (eslint.config.mjs)", () => {
  it("fails the engine importing from the app", async () => {
    const errors = await layerErrors(
      'import { cn } from "@/components/ui/cn";\nexport const x = cn("a");\n',
      "kinematics/probe.ts",
    );
    expect(errors).toContain("import-x/no-restricted-paths");
  }, 60_000);

  it("fails lib/ importing a component", async () => {
    const errors = await layerErrors(
      'import { cn } from "../../components/ui/cn";\nexport const x = cn("a");\n',
      "lib/shared/probe.ts",
    );
    expect(errors).toContain("import-x/no-restricted-paths");
  }, 60_000);

  it("fails a component importing a database query, and lets it import db types", async () => {
    const valueImport = 'import { getPlanForUser } from "@/db/queries/plans";\nexport const f = getPlanForUser;\n';
    expect(await layerErrors(valueImport, "components/editor/probe.ts")).toContain(
      "@typescript-eslint/no-restricted-imports",
    );
    const typeImport =
      'import type { plans } from "@/db/schema/plans";\nexport type Row = typeof plans.$inferSelect;\n';
    expect(await layerErrors(typeImport, "components/editor/probe.ts")).toEqual([]);
  }, 60_000);

  it("fails the database client opened outside lib/server and db/, and allows it in lib/server", async () => {
    const code = 'import { db } from "@/db";\nexport const d = db;\n';
    expect(await layerErrors(code, "app/api/probe/route.ts")).toContain("import-x/no-restricted-paths");
    expect(await layerErrors(code, "lib/server/probe.ts")).toEqual([]);
  }, 60_000);

  describe("cycles", () => {
    let dir = "";
    beforeAll(() => {
      dir = mkdtempSync(path.join(root, "tests/unit/lint/.probe-"));
      writeFileSync(path.join(dir, "a.ts"), 'import { b } from "./b";\nexport const a = () => b();\n');
      // The way back goes through the `@/` alias, as most of the tree's imports do.
      const alias = `@/${path.relative(root, dir)}/a`;
      writeFileSync(path.join(dir, "b.ts"), `import { a } from "${alias}";\nexport const b = (): unknown => a;\n`);
      writeFileSync(path.join(dir, "c.ts"), 'import { d } from "./d";\nexport const c = () => d;\n');
      writeFileSync(path.join(dir, "d.ts"), "export const d = 1;\n");
    });
    afterAll(() => rmSync(dir, { recursive: true, force: true }));

    it("fails two modules that import each other, and passes a one-way import", async () => {
      const [cyclic, oneWay] = await eslint.lintFiles([path.join(dir, "a.ts"), path.join(dir, "c.ts")]);
      expect(cyclic.messages.map((m) => m.ruleId)).toContain("import-x/no-cycle");
      expect(oneWay.messages.filter((m) => m.ruleId === "import-x/no-cycle")).toEqual([]);
    }, 60_000);
  });
});
