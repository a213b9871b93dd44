/**
 * The field-event form is built on the endpoint's contract: its messages show beside the
 * fields (the same words the server gives for the same body), amounts typed in US customary
 * units are queued in the stored metric units, and only the fields of the chosen kind and
 * method are sent. Unit factors are the exact definitions of NIST Handbook 44, Appendix C:
 * 1 in = 25.4 mm, 1 ft = 0.3048 m, 1 US gal = 231 in³ = 3.785411784 L, 1 lb = 453.59237 g.
 */
import { createFieldEventBody } from '@common/contracts/records';
import { fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import type { QueuedEntry } from '../../src/features/field-log/components/entry-forms';
import { FieldEventForm } from '../../src/features/field-log/components/field-event-form';

const siteId = '00000000-0000-4000-8000-000000000002';

function setup(units: 'metric' | 'us') {
  const saved: QueuedEntry[][] = [];
  const onSave = vi.fn(async (entries: QueuedEntry[]) => {
    saved.push(entries);
  });
  render(
    <FieldEventForm
      slug="brookfold"
      siteId={siteId}
      date="2026-07-01"
      units={units}
      onSave={onSave}
    />,
  );
  const form = screen.getByRole('form', { name: 'Field event' });
  const type = (label: string | RegExp, value: string) =>
    fireEvent.change(within(form).getByLabelText(label), { target: { value } });
  const save = () => fireEvent.click(within(form).getByRole('button', { name: 'Save event' }));
  return { saved, onSave, form, type, save };
}

/** The message tied to a field for screen readers (its aria-describedby), as shown. */
function messageOf(input: HTMLElement) {
  const ids = input.getAttribute('aria-describedby')?.split(' ') ?? [];
  return ids.map((id) => document.getElementById(id)?.textContent).join(' ');
}

/** What the server's own contract answers for a body, by field. */
function serverMessages(body: Record<string, unknown>) {
  const result = createFieldEventBody.safeParse({
    id: '00000000-0000-4000-8000-0000000000e1',
    siteId,
    occurredOn: '2026-07-01',
    ...body,
  });
  return Object.fromEntries((result.error?.issues ?? []).map((i) => [i.path.join('.'), i.message]));
}

describe('the field-event form', () => {
  it("shows the contract's message beside a negative rain reading and queues nothing", async () => {
    const { form, type, save, onSave } = setup('metric');
    type('What happened', 'rainfall');
    type('Rain gauge reading (mm)', '-3');
    save();
    const rain = within(form).getByLabelText('Rain gauge reading (mm)');
    await waitFor(() => expect(rain.getAttribute('aria-invalid')).toBe('true'));
    expect(messageOf(rain)).toBe('Rain cannot be negative.');
    expect(serverMessages({ kind: 'rainfall', rainMm: -3 })).toEqual({
      rainMm: 'Rain cannot be negative.',
    });
    expect(onSave).not.toHaveBeenCalled();
  });

  it('asks for what was applied and the rate, beside each, until "none applied" is ticked', async () => {
    const { form, type, save, saved, onSave } = setup('metric');
    type('What happened', 'fertilizer');
    within(form).getByRole('complementary', { name: 'Caution: Handling fertilizer' });
    save();
    const what = within(form).getByLabelText('What was applied');
    await waitFor(() => expect(what.getAttribute('aria-invalid')).toBe('true'));
    const expected = serverMessages({ kind: 'fertilizer' });
    expect(messageOf(what)).toBe(expected.amendmentKind);
    expect(messageOf(within(form).getByLabelText('Rate (g/m²)'))).toBe(expected.rateGPerM2);
    expect(expected.amendmentKind).toBe('Enter what was applied, or mark "none applied".');
    expect(onSave).not.toHaveBeenCalled();

    fireEvent.click(within(form).getByLabelText('None applied (recorded on purpose)'));
    expect(within(form).queryByLabelText('What was applied')).toBeNull();
    save();
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(1));
    expect(saved[0]![0]!.body).toMatchObject({
      kind: 'fertilizer',
      noneApplied: true,
      amendmentKind: null,
      rateGPerM2: null,
      siteId,
      occurredOn: '2026-07-01',
    });
    expect(saved[0]![0]!.label).toBe('2026-07-01 · Fertilizer: none applied');
  });

  it('converts a drip event typed in gallons and inches to litres and millimetres', async () => {
    const { form, type, save, saved, onSave } = setup('us');
    within(form).getByRole('complementary', {
      name: 'Caution: Irrigation connected to drinking water',
    });
    type('Run time (min)', '60');
    type('Emitter flow (gal/h)', '0,6');
    type('Emitter spacing (in)', '12');
    type('Wetted width (in)', '12');
    // 0.6 gal/h over a 1 ft × 1 ft strip for 1 h: 0.6 × 231 in³ ÷ 144 in² = 0.9625 in.
    await within(form).findByText('Depth of water applied over the wetted area: 0.96 in');
    save();
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(1));
    const body = saved[0]![0]!.body as Record<string, number | string | null>;
    expect(body).toMatchObject({
      kind: 'irrigation',
      irrigationMethod: 'drip',
      runTimeMin: 60,
      dripEmitterSpacingMm: 304.8,
      wettedWidthMm: 304.8,
      dripLineFlowLPerHPerM: null,
      rainMm: null,
    });
    expect(body.dripEmitterFlowLPerH).toBeCloseTo(0.6 * 3.785411784, 12);
    // The server takes what was queued as it is.
    expect(createFieldEventBody.safeParse(body).success).toBe(true);
    // The kind and method stay for the next event; the amounts are cleared.
    expect((within(form).getByLabelText('What happened') as HTMLSelectElement).value).toBe(
      'irrigation',
    );
    expect((within(form).getByLabelText('Run time (min)') as HTMLInputElement).value).toBe('');
  });

  it('converts rain in inches and a fertilizer rate in lb per 100 ft² to the stored units', async () => {
    const { type, save, saved, onSave } = setup('us');
    type('What happened', 'rainfall');
    type('Rain gauge reading (in)', '0.5');
    save();
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(1));
    // 0.5 in × 25.4 mm/in = 12.7 mm, stored without float noise.
    expect(saved[0]![0]!.body).toMatchObject({ kind: 'rainfall', rainMm: 12.7 });
    expect(saved[0]![0]!.label).toBe('2026-07-01 · Rain 0.5 in');

    type('What happened', 'fertilizer');
    type('What was applied', 'Composted poultry manure');
    type('Rate (lb/100 ft²)', '2');
    save();
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(2));
    // 2 × 453.59237 g ÷ (100 × 0.3048² m²) = 907.18474 g ÷ 9.290304 m² = 97.6486 g/m².
    const rate = (saved[1]![0]!.body as { rateGPerM2: number }).rateGPerM2;
    expect(rate).toBeCloseTo(907.18474 / 9.290304, 10);
    expect(saved[1]![0]!.body).toMatchObject({
      amendmentKind: 'Composted poultry manure',
      rainMm: null,
    });
  });

  it('sends only the fields of the chosen method: text left in a hidden field neither blocks nor travels', async () => {
    const { form, type, save, saved, onSave } = setup('metric');
    type('Emitter flow (L/h)', 'two');
    fireEvent.click(within(form).getByRole('radio', { name: 'Overhead sprinkler' }));
    expect(within(form).queryByLabelText('Emitter flow (L/h)')).toBeNull();
    type('Run time (min)', '30');
    type('Sprinkler precipitation rate (mm/h)', '12');
    // 12 mm/h for half an hour.
    await within(form).findByText('Depth of water applied over the wetted area: 6 mm');
    save();
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(1));
    expect(saved[0]![0]!.body).toMatchObject({
      irrigationMethod: 'overhead',
      runTimeMin: 30,
      sprinklerRateMmPerH: 12,
      dripEmitterFlowLPerH: null,
      wettedWidthMm: null,
    });
  });

  it("says a typed word is not a number, in the contract's words", async () => {
    const { form, type, save, onSave } = setup('metric');
    type('Run time (min)', 'forty');
    save();
    const run = within(form).getByLabelText('Run time (min)');
    await waitFor(() => expect(messageOf(run)).toBe('Run time must be a number.'));
    expect(onSave).not.toHaveBeenCalled();
  });
});
