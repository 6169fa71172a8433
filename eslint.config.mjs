// The project's lint rules: eslint's and typescript-eslint's recommended sets (without type
// information, so a run takes seconds), minus the rules listed below with the reason each is off.
import js from "@eslint/js";
import tseslint from "typescript-eslint";

export default tseslint.config(
  {
    ignores: [
      "**/node_modules/**",
      "**/dist/**",
      "**/build/**",
      "widgets/labextension/**",
      "widgets/widget-manager/**",
      "widgets/lib/**",
      "widgets/lab-core/**",
      "lab-frontend/**",
      "kernel-ext/examples/**",
      "kernel-ext/lab-frontend/**",
      "test-output/**",
      "**/*.d.ts",
    ],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: {
      ecmaVersion: 2022,
      sourceType: "module",
      globals: {
        // Node and browser globals the packages use (lib itself uses neither)
        console: "readonly",
        process: "readonly",
        Buffer: "readonly",
        setTimeout: "readonly",
        clearTimeout: "readonly",
        setInterval: "readonly",
        clearInterval: "readonly",
        setImmediate: "readonly",
        clearImmediate: "readonly",
        queueMicrotask: "readonly",
        URL: "readonly",
        TextEncoder: "readonly",
        TextDecoder: "readonly",
        structuredClone: "readonly",
        performance: "readonly",
        globalThis: "readonly",
        window: "readonly",
        document: "readonly",
        self: "readonly",
        fetch: "readonly",
        AbortController: "readonly",
        __dirname: "readonly",
        require: "readonly",
        module: "writable",
      },
    },
    rules: {
      // names starting with "_" are deliberately unused (interface-shaped parameters, destructuring)
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none", ignoreRestSiblings: true }],
      // lazy loading: the command table loads each command's module on use; CommonJS scripts
      "@typescript-eslint/no-require-imports": "off",
      // a value given at the declaration and overwritten in every branch is kept for readability
      "no-useless-assignment": "off",
      // errors restated for the user carry their own message; the cause is not always wanted
      "preserve-caught-error": "off",
      // ANSI escape sequences are matched on purpose (terminal output in notebooks)
      "no-control-regex": "off",
    },
  },
  {
    // tests drive untyped page and protocol objects (playwright evaluate, raw Jupyter messages)
    files: ["test/**"],
    rules: { "@typescript-eslint/no-explicit-any": "off" },
  },
  {
    files: ["test/bench/**"],
    languageOptions: { globals: { Event: "readonly" } },
  },
);
