import path from 'node:path';

/**
 * Features in apps/web/src/features/<name> must not import each other: what two
 * features share belongs in components/, lib/, config/ or app/ (the bulletproof-react rule).
 * Handles both relative imports and the `@/` alias for apps/web/src.
 */
const webSrc = path.resolve(import.meta.dirname, '../../apps/web/src');
const featuresDir = path.join(webSrc, 'features');

function featureOf(file) {
  const rel = path.relative(featuresDir, file);
  if (rel.startsWith('..') || path.isAbsolute(rel)) return undefined;
  return rel.split(path.sep)[0];
}

export const featureBoundaries = {
  meta: {
    type: 'problem',
    docs: { description: 'forbid imports between web features' },
    messages: {
      crossFeature: "Feature '{{from}}' imports from feature '{{to}}'. Move what both need into src/components, src/lib or src/config.",
    },
    schema: [],
  },
  create(context) {
    const file = context.filename;
    const own = featureOf(file);
    if (!own) return {};
    function check(node, source) {
      if (typeof source !== 'string') return;
      let target;
      if (source.startsWith('@/')) target = path.join(webSrc, source.slice(2));
      else if (source.startsWith('.')) target = path.resolve(path.dirname(file), source);
      else return;
      const to = featureOf(target);
      if (to && to !== own) context.report({ node, messageId: 'crossFeature', data: { from: own, to } });
    }
    return {
      ImportDeclaration: (node) => check(node, node.source.value),
      ExportNamedDeclaration: (node) => node.source && check(node, node.source.value),
      ExportAllDeclaration: (node) => check(node, node.source.value),
      ImportExpression: (node) => node.source.type === 'Literal' && check(node, node.source.value),
    };
  },
};
