/**
 * The field log's "Add photo": the caption is checked by the upload's contract when a photo is
 * chosen, its message shows beside the caption, and nothing is kept until it is right.
 */
import { fireEvent, render, screen, waitFor } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import type { NewOutboxItem } from '../../src/features/field-log/api/outbox';
import { PlotPhoto } from '../../src/features/field-log/components/plot-photo';

const plot = {
  plotId: '00000000-0000-4000-8000-000000000003',
  siteId: '00000000-0000-4000-8000-000000000002',
  siteName: 'Brookfold Allotment',
  plotNumber: 101,
  block: 1,
  entryId: '00000000-0000-4000-8000-000000000004',
  entryCode: 'E1',
  entryName: 'Tallow Finger',
  position: 1,
  plantsSet: 10,
  plantsSurviving: null,
};

function setup() {
  const queued: NewOutboxItem[][] = [];
  const onQueue = vi.fn(async (items: NewOutboxItem[]) => {
    queued.push(items);
  });
  render(<PlotPhoto slug="brookfold" plot={plot} date="2026-07-01" onQueue={onQueue} />);
  const caption = screen.getByLabelText('Photo caption') as HTMLInputElement;
  const choose = () =>
    fireEvent.change(screen.getByLabelText('Add photo'), {
      target: { files: [new File(['jpeg'], 'pods.jpg', { type: 'image/jpeg' })] },
    });
  return { queued, onQueue, caption, choose };
}

describe('adding a photo at a plot', () => {
  it("answers a blank caption with the contract's message beside it and keeps nothing", async () => {
    const { onQueue, caption, choose } = setup();
    fireEvent.change(caption, { target: { value: '   ' } });
    choose();
    await waitFor(() => expect(caption.getAttribute('aria-invalid')).toBe('true'));
    const message = document.getElementById(
      caption.getAttribute('aria-describedby')!.split(' ').at(-1)!,
    );
    expect(message?.textContent).toBe(
      'Describe the photo: the caption is what people hear when they cannot see it.',
    );
    expect(onQueue).not.toHaveBeenCalled();
  });

  it('keeps the photo with the suggested caption, then with a caption typed by the grower', async () => {
    const { queued, onQueue, caption, choose } = setup();
    expect(caption.value).toBe('Plot 101, Tallow Finger (E1), 2026-07-01');
    choose();
    await waitFor(() => expect(onQueue).toHaveBeenCalledTimes(1));
    expect(queued[0]![0]).toMatchObject({
      kind: 'photo',
      url: '/api/trials/brookfold/photos',
      body: { caption: 'Plot 101, Tallow Finger (E1), 2026-07-01', plotId: plot.plotId },
      fileName: 'pods.jpg',
    });

    fireEvent.change(caption, { target: { value: '  Leaf mottling on the lower leaves ' } });
    choose();
    await waitFor(() => expect(onQueue).toHaveBeenCalledTimes(2));
    expect(queued[1]![0]!.body).toMatchObject({ caption: 'Leaf mottling on the lower leaves' });
    // Kept: the field goes back to the suggestion for the next photo.
    await waitFor(() => expect(caption.value).toBe('Plot 101, Tallow Finger (E1), 2026-07-01'));
  });
});
