import { describe, expect, it } from 'vitest';
import { cautionIds, cautions, selectCautions } from './cautions.ts';
import { readability } from '../testing/readability.ts';

describe('cautions (PRODUCT.md §8)', () => {
  it('cover every point of §8: survey not assessment or warranty, estimates not quotes, licensed work and permits under local codes, utility locating, sewer gas, excavations and jetting', () => {
    const all = cautionIds.map((id) => cautions[id].text).join(' ');
    expect(all).toMatch(/not an engineering assessment and not a warranty/);
    expect(all).toMatch(/estimated ranges, not quotes/);
    expect(all).toMatch(/licensed contractor/);
    expect(all).toMatch(/permit/);
    expect(all).toMatch(/Local codes govern/);
    expect(all).toMatch(/must be found and marked/);
    expect(all).toMatch(/Sewer gas/);
    expect(all).toMatch(/Trenches and pits can cave in/);
    expect(all).toMatch(/Hydro-jetting uses water at pressures that can cut skin/);
  });

  it('always shows the survey caution and sewer gas; shows cost cautions only with costs', () => {
    const ids = selectCautions({ grade: 'clear', recommendationKinds: ['monitor'], costOptionKinds: [], materials: ['pvc'] }).map(
      (c) => c.id,
    );
    expect(ids).toEqual(['camera_survey_only', 'sewer_gas']);
  });

  it('an excavation option brings utility locating and open-dig cautions', () => {
    const ids = selectCautions({
      grade: 'repair_now',
      recommendationKinds: ['spot_repair'],
      costOptionKinds: ['spot_repairs'],
      materials: [],
    }).map((c) => c.id);
    expect(ids).toEqual(
      expect.arrayContaining(['estimates_not_quotes', 'licensed_and_permitted', 'locate_before_digging', 'open_excavation']),
    );
  });

  it('a jetting recommendation brings the high-pressure caution; a failing grade the backup caution; asbestos-cement pipe its own', () => {
    expect(
      selectCautions({ grade: 'maintain', recommendationKinds: ['hydro_jetting'], costOptionKinds: ['cleaning'], materials: [] }).map(
        (c) => c.id,
      ),
    ).toContain('high_pressure_jetting');
    expect(selectCautions({ grade: 'failing', recommendationKinds: [], costOptionKinds: [], materials: [] }).map((c) => c.id)).toContain(
      'failing_line',
    );
    expect(
      selectCautions({ grade: 'clear', recommendationKinds: [], costOptionKinds: [], materials: ['asbestos_cement'] }).map((c) => c.id),
    ).toContain('asbestos_pipe');
  });

  it('are written in plain words (Flesch reading ease ≥ 50 each; Flesch 1948)', () => {
    for (const id of cautionIds) expect(readability(cautions[id].text).ease, id).toBeGreaterThanOrEqual(50);
  });
});
