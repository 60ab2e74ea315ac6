// Lint configuration (`npm run lint`, run by .ci/run): eslint's recommended rules and
// typescript-eslint's recommended rules over everything committed in TypeScript, tests, bench and
// scripts included. Formatting is left to the existing style (no formatter is enforced, so that
// parallel edits never conflict on whitespace); rules that would only restyle code are off.
import js from "@eslint/js";
import globals from "globals";
import tseslint from "typescript-eslint";

export default tseslint.config(
  { ignores: ["dist/", "build/", "node_modules/", "assembly/", "test-artifacts/", "reports/"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ["**/*.ts", "**/*.js", "**/*.mjs"],
    languageOptions: { globals: { ...globals.node } },
    rules: {
      // Unused names are errors, except the `_name` convention for a deliberately ignored value.
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none" }],
    },
  },
  {
    // Tests read JSON shaped by the code under test; `any` there is a cast, not a design.
    files: ["test/**/*.ts"],
    rules: { "@typescript-eslint/no-explicit-any": "off" },
  },
);
