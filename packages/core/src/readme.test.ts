import { describe, expect, it } from 'vitest';
import readme from '../README.md?raw';
import { gradeRules } from './grading/grade.ts';
import { findingRules } from './recommendations/recommendations.ts';
import { cautionIds } from './cautions/cautions.ts';
import { costOptionKinds } from './costing/cost-options.ts';
import { observationKinds } from './model/kinds.ts';

// The README documents every rule; this keeps it from falling behind the code.

describe('core README', () => {
  it('documents every grade rule, recommendation rule, cost option, caution and observation kind by id', () => {
    const ids = [...gradeRules.map((r) => r.id), ...findingRules.map((r) => r.id), ...costOptionKinds, ...cautionIds, ...observationKinds];
    const missing = ids.filter((id) => !readme.includes(`\`${id}\``));
    expect(missing).toEqual([]);
  });
});
