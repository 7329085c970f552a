import { readdirSync } from "node:fs";
import js from "@eslint/js";
import { createTypeScriptImportResolver } from "eslint-import-resolver-typescript";
import importX from "eslint-plugin-import-x";
import globals from "globals";
import tseslint from "typescript-eslint";

// Client features never import each other; app/routes composes them (STYLE.md §1).
const features = (() => {
  try {
    return readdirSync("src/features", { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name);
  } catch {
    return [];
  }
})();

const boundaryZones = [
  { target: "./shared", from: ["./server", "./src", "./sensors-sim", "./tests"], message: "shared/ is imported by the others and imports none of them." },
  { target: "./server", from: ["./src", "./sensors-sim"], message: "The server does not import the client or the simulator." },
  { target: "./src", from: ["./server", "./sensors-sim", "./tests"], message: "The client imports only shared/ besides itself." },
  { target: "./sensors-sim", from: ["./server", "./src"], message: "The simulator talks to the server only over MQTT." },
  { target: ["./src/components", "./src/lib", "./src/config", "./src/hooks"], from: ["./src/features", "./src/app"], message: "Generic client code does not depend on features or routes." },
  { target: "./src/features", from: "./src/app", message: "Features do not import routes." },
  ...features.map((name) => ({
    target: `./src/features/${name}`,
    from: "./src/features",
    except: [`./${name}`],
    message: "Features do not import each other; compose them in app/routes.",
  })),
];

export default tseslint.config(
  { ignores: ["dist/", "node_modules/", "data/", "coverage/"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    plugins: { "import-x": importX },
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    settings: {
      // Resolve "./x.js" to x.ts the way tsc does, so the boundary rule sees every import.
      "import-x/resolver-next": [createTypeScriptImportResolver({ project: ["tsconfig.server.json", "tsconfig.web.json"], noWarnOnMultipleProjects: true })],
    },
    rules: {
      "import-x/no-restricted-paths": ["error", { zones: boundaryZones }],
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports" }],
      "no-restricted-syntax": [
        "error",
        { selector: "ThrowStatement > Literal", message: "Throw an AppError (or Error), never a string." },
      ],
    },
  },
);
