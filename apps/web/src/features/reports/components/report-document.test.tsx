import { screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { analyseInspection, demoPriceBook, feet, gradeInfo, inspectionSchema } from '@underfoot/core';
import { describe, expect, it } from 'vitest';
import { renderWithProviders } from '@/test/render';
import { signedInMedia, type RevisionView } from '../api';
import { findingAnchor, ReportDocument } from './report-document';

function revision(options: { costsHidden?: boolean } = {}): RevisionView {
  const inspection = inspectionSchema.parse({
    id: 'o1',
    property: { yearBuilt: 1931, type: 'single_family', notes: '' },
    accessPoints: [{ id: 'ap-1', kind: 'cleanout_two_way', locationNote: '' }],
    runs: [
      {
        id: 'run-1',
        accessPointId: 'ap-1',
        direction: 'toward_main',
        distanceReached: feet(40),
        endReason: 'reached_main',
        videoFileId: 'video-1',
        sections: [{ id: 's1', from: 0, to: feet(40), material: 'vitrified_clay', diameterIn: 4 }],
        observations: [
          { id: 'obs-offset', kind: 'joint_offset', at: feet(12), severity: 4, videoTime: 4, stillIds: ['still-1'] },
          { id: 'obs-roots', kind: 'roots', at: feet(20), severity: 2 },
        ],
      },
    ],
    checkedNotFound: ['sag'],
  });
  const analysis = analyseInspection(inspection, demoPriceBook);
  if (options.costsHidden) analysis.costs = { ...analysis.costs, options: [], proposed: null };
  return {
    number: 1,
    kind: 'original',
    note: '',
    publishedAt: '2026-11-30T16:00:00.000Z',
    gradeInfo: gradeInfo[analysis.grade.level],
    costsHidden: options.costsHidden ?? false,
    snapshot: {
      orderId: 'o1',
      kind: 'pre_purchase',
      orderingSide: 'buyer',
      property: { address: '12 Sluice Row, Alder Falls, OR 97411', yearBuilt: 1931, propertyType: 'Single-family house' },
      company: { name: 'Mudlark Drain Testing', licenceNumber: 'AF-1', phone: '(555) 010-0000', email: null, footer: null },
      inspector: { name: 'Marco Ruiz' },
      inspectedOn: '2026-11-29',
      inspection,
      analysis,
      media: [
        {
          id: 'video-1',
          kind: 'video',
          observationId: null,
          runId: 'run-1',
          renderedId: null,
          hasThumbnail: false,
          videoTime: null,
          footage: null,
        },
        {
          id: 'still-1',
          kind: 'still',
          observationId: 'obs-offset',
          runId: 'run-1',
          renderedId: 'rendered-1',
          hasThumbnail: true,
          videoTime: 4,
          footage: feet(12),
        },
      ],
    },
  };
}

describe('the report page', () => {
  it('puts the grade and what it means for this reader first, and numbers findings as the diagram pins them', () => {
    renderWithProviders(<ReportDocument revision={revision()} changes={null} readerSide="seller" media={signedInMedia} />);
    expect(screen.getByRole('heading', { level: 2, name: 'Repair now' })).toBeInTheDocument();
    expect(screen.getByRole('heading', { name: 'What this means for you' }).nextElementSibling?.textContent).toMatch(
      /buyer will want fixed/,
    );
    const findings = screen.getByRole('region', { name: /What the camera found/ });
    expect(within(findings).getByRole('heading', { level: 3, name: '1. Joint offset' })).toBeInTheDocument();
    // Each pin links to its finding, and the finding carries that anchor.
    expect(document.querySelector(`svg a[href="#${findingAnchor('obs-offset')}"]`)).not.toBeNull();
    expect(document.getElementById(findingAnchor('obs-offset'))).not.toBeNull();
    // The marked-up copy is what readers see.
    expect(within(findings).getByRole('img', { name: /marked up/ })).toHaveAttribute('src', '/api/media/rendered-1/file');
    expect(screen.getByText(/An estimate, not a quote/)).toBeInTheDocument();
  });

  it('opens the still large and the video at the finding’s moment', async () => {
    const user = userEvent.setup();
    renderWithProviders(<ReportDocument revision={revision()} changes={null} readerSide="buyer" media={signedInMedia} />);
    await user.click(screen.getByRole('button', { name: /Joint offset, picture 1/ }));
    expect(screen.getByRole('dialog', { name: /1\. Joint offset, at 12' 0"/ })).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Close' }));
    await user.click(screen.getByRole('button', { name: /Watch in the video/ }));
    const player = screen.getByRole('dialog', { name: /in the video at 0:04/ });
    expect(player.querySelector('video')).toHaveAttribute('src', '/api/media/video-1/file');
  });

  it('says so when a share link leaves the costs out, and speaks of the buyer to a guest', () => {
    renderWithProviders(
      <ReportDocument revision={revision({ costsHidden: true })} changes={null} readerSide={null} media={signedInMedia} />,
    );
    expect(screen.getByText('Cost ranges are not included in this copy of the report.')).toBeInTheDocument();
    expect(screen.getByRole('heading', { name: 'What this means for the buyer' })).toBeInTheDocument();
  });
});
