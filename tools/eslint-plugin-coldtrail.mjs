// Local ESLint rules that check the architecture: which modules each part of the workspace may import.
import { isBuiltin } from "node:module";
import path from "node:path";

/**
 * A forbidden-module list entry: a bare name ("knex" also forbids "knex/…"), a prefix ending in "/"
 * or "*" ("@/lib/server/*"), the keyword "node:builtins" (every Node.js built-in module), or
 * { resolved: "<absolute dir>" } for relative imports that land inside that directory.
 */
function matches(entry, specifier, filename) {
  if (typeof entry === "object") {
    if (!specifier.startsWith(".")) return false;
    const target = path.resolve(path.dirname(filename), specifier);
    return target === entry.resolved || target.startsWith(entry.resolved + path.sep);
  }
  if (entry === "node:builtins") return isBuiltin(specifier);
  if (entry.endsWith("*")) return specifier.startsWith(entry.slice(0, -1));
  if (entry.endsWith("/")) return specifier.startsWith(entry);
  return specifier === entry || specifier.startsWith(entry + "/");
}

function isClientModule(program) {
  for (const statement of program.body) {
    if (statement.type !== "ExpressionStatement" || typeof statement.directive !== "string") return false;
    if (statement.directive === "use client") return true;
  }
  return false;
}

/** @type {import("eslint").Rule.RuleModule} */
const importBoundary = {
  meta: {
    type: "problem",
    docs: { description: "Forbid imports that cross an architectural boundary of the workspace." },
    schema: [
      {
        type: "object",
        properties: {
          boundary: { type: "string" },
          forbidden: { type: "array" },
          onlyClientModules: { type: "boolean" },
          allowTypeImports: { type: "boolean" },
        },
        required: ["boundary", "forbidden"],
        additionalProperties: false,
      },
    ],
    messages: { forbidden: '"{{specifier}}" must not be imported here: {{boundary}}.' },
  },
  create(context) {
    const { boundary, forbidden, onlyClientModules = false, allowTypeImports = false } = context.options[0];
    const filename = context.filename;
    let active = !onlyClientModules;

    function check(node, source, typeOnly) {
      if (!active || !source || source.type !== "Literal" || typeof source.value !== "string") return;
      if (typeOnly && allowTypeImports) return;
      const specifier = source.value;
      if (forbidden.some((entry) => matches(entry, specifier, filename))) {
        context.report({ node: source, messageId: "forbidden", data: { specifier, boundary } });
      }
    }

    const typeOnlyImport = (node) =>
      node.importKind === "type" || (node.specifiers.length > 0 && node.specifiers.every((s) => s.importKind === "type"));

    return {
      Program(node) {
        if (onlyClientModules) active = isClientModule(node);
      },
      ImportDeclaration: (node) => check(node, node.source, typeOnlyImport(node)),
      ExportNamedDeclaration: (node) => check(node, node.source, node.exportKind === "type"),
      ExportAllDeclaration: (node) => check(node, node.source, node.exportKind === "type"),
      ImportExpression: (node) => check(node, node.source, false),
      TSImportEqualsDeclaration: (node) =>
        node.moduleReference.type === "TSExternalModuleReference" &&
        check(node, node.moduleReference.expression, node.importKind === "type"),
      CallExpression(node) {
        if (node.callee.type === "Identifier" && node.callee.name === "require" && node.arguments.length === 1) {
          check(node, node.arguments[0], false);
        }
      },
    };
  },
};

export default { meta: { name: "eslint-plugin-coldtrail" }, rules: { "import-boundary": importBoundary } };
