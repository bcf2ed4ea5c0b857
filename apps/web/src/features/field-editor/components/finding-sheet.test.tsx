import { render, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { feet, feetAndInches, runSchema } from '@underfoot/core';
import { describe, expect, it, vi } from 'vitest';
import { FindingSheet } from './finding-sheet';

const run = runSchema.parse({
  id: 'r1',
  accessPointId: 'ap',
  direction: 'toward_main',
  distanceReached: feet(30),
  endReason: 'reached_main',
});

function open(overrides: Partial<Parameters<typeof FindingSheet>[0]> = {}) {
  const onSave = vi.fn();
  render(
    <FindingSheet
      open
      onClose={() => undefined}
      run={run}
      observation={null}
      videoTimeHint={null}
      readOnly={false}
      onSave={onSave}
      onDelete={() => undefined}
      {...overrides}
    />,
  );
  return { onSave, person: userEvent.setup() };
}

describe('adding a finding', () => {
  it('takes footage the way the trade says it, the kind and the severity with the guide', async () => {
    const { onSave, person } = open({ videoTimeHint: 83.4 });
    await person.type(screen.getByLabelText('Where, from the access point'), `24' 6"`);
    await person.click(screen.getByText('Roots'));
    expect(screen.getByText('The guide for roots:')).toBeInTheDocument();
    await person.click(screen.getByRole('radio', { name: /^3 · Moderate/ }));
    await person.selectOptions(screen.getByLabelText('Clock position'), '12');
    expect(screen.getByLabelText('Video time')).toHaveValue('1:23.4');
    await person.click(screen.getByRole('button', { name: 'Add finding' }));
    expect(onSave).toHaveBeenCalledTimes(1);
    const [observation, extendTo] = onSave.mock.calls[0]!;
    expect(observation).toMatchObject({ kind: 'roots', at: feetAndInches(24, 6), severity: 3, clock: 12, videoTime: 83.4, stillIds: [] });
    expect(extendTo).toBeNull();
  });

  it('asks for a severity on a defect and says what is wrong with the footage', async () => {
    const { onSave, person } = open();
    await person.type(screen.getByLabelText('Where, from the access point'), `5' 14"`);
    await person.click(screen.getByText('Crack'));
    await person.click(screen.getByRole('button', { name: 'Add finding' }));
    expect(onSave).not.toHaveBeenCalled();
    expect(screen.getByText(/write 6' 2" instead of 5' 14"/)).toBeInTheDocument();
    expect(screen.getByText('Choose a severity from 1 to 5.')).toBeInTheDocument();
  });

  it('gives a feature no severity, and moves the end of the run out to a finding past it', async () => {
    const { onSave, person } = open();
    await person.type(screen.getByLabelText('Where, from the access point'), '41 ft');
    await person.click(screen.getByText('Bend'));
    expect(screen.queryByText(/The guide for/)).not.toBeInTheDocument();
    expect(screen.getByText(/saving moves the end of the run out to/)).toBeInTheDocument();
    await person.selectOptions(screen.getByLabelText('Bend angle'), 'deg_90');
    await person.click(screen.getByRole('button', { name: 'Add finding' }));
    const [observation, extendTo] = onSave.mock.calls[0]!;
    expect(observation).toMatchObject({ kind: 'bend', at: feet(41), angle: 'deg_90' });
    expect(observation).not.toHaveProperty('severity');
    expect(extendTo).toBe(feet(41));
  });

  it('wants a reason when the chosen severity differs from what the measure suggests', async () => {
    const { onSave, person } = open();
    await person.type(screen.getByLabelText('Where, from the access point'), '12');
    await person.click(screen.getByText('Roots'));
    await person.type(screen.getByLabelText(/Measured share of the pipe opening/), '40');
    expect(screen.getByText('(guide’s suggestion)')).toBeInTheDocument();
    await person.click(screen.getByRole('radio', { name: /^2 · Small/ }));
    await person.click(screen.getByRole('button', { name: 'Add finding' }));
    expect(onSave).not.toHaveBeenCalled();
    await person.type(screen.getByLabelText(/Why 2 rather than the guide’s 4/), 'Soft fibrous roots only');
    await person.click(screen.getByRole('button', { name: 'Add finding' }));
    expect(onSave.mock.calls[0]![0]).toMatchObject({ severity: 2, measurePercent: 40, severityReason: 'Soft fibrous roots only' });
  });
});
