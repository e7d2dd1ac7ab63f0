import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";
import { createTypeScriptImportResolver } from "eslint-import-resolver-typescript";
import importX from "eslint-plugin-import-x";

/**
 * The import layers (DEVELOPERS.md, "Where things go, and what may import what"):
 * - kinematics/ is the engine: it imports nothing from the app;
 * - lib/ never imports components/ or app/;
 * - components/ imports only types from db/ (data reaches components through pages and the API);
 * - only lib/server/ and db/ open the database client (db/index.ts); integration tests read it to verify writes, benchmarks to set up and count rows;
 * - no import cycles anywhere (type-only imports do not count: they vanish at compile time).
 */
const layerZones = [
  {
    target: "./kinematics",
    from: ["./app", "./components", "./lib", "./db", "./bin", "./scripts", "./tests", "./bench"],
    message: "The engine (kinematics/) is pure: it imports nothing from the app.",
  },
  {
    target: "./lib",
    from: ["./components", "./app"],
    message: "lib/ sits below the UI: it never imports components/ or app/.",
  },
  {
    target: ["./app", "./components", "./kinematics", "./lib/client", "./lib/shared", "./bin", "./proxy.ts"],
    from: "./db/index.ts",
    message: "Only lib/server/ and db/ open the database client; use a named query from db/queries/.",
  },
];

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: [".next/**", "node_modules/**", ".data/**", "db/migrations/**", "next-env.d.ts", "bench/tmp/**"],
  },
  {
    rules: {
      "@typescript-eslint/no-explicit-any": "error",
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    files: ["**/*.{ts,tsx,mts,cts,js,mjs,jsx}"],
    plugins: { "import-x": importX },
    settings: {
      // The cycle rule parses every imported file; without this it reads TypeScript with the JavaScript parser and sees no imports.
      "import-x/parsers": { "@typescript-eslint/parser": [".ts", ".tsx", ".mts", ".cts"] },
      "import-x/resolver-next": [createTypeScriptImportResolver({ alwaysTryTypes: true, project: "./tsconfig.json" })],
    },
    rules: {
      "import-x/no-restricted-paths": ["error", { zones: layerZones }],
      "import-x/no-cycle": ["error", { ignoreExternal: true }],
    },
  },
  {
    files: ["components/**/*.{ts,tsx}"],
    rules: {
      "@typescript-eslint/no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["@/db", "@/db/*", "**/db", "**/db/*"],
              allowTypeImports: true,
              message: "components/ may import only types from db/; load data in a page or through the API.",
            },
          ],
        },
      ],
    },
  },
];

export default config;
