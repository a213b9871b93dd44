/**
 * The field log's entry forms ask "are you sure?" before saving a value outside its trait's
 * plausible range, inside the form itself, and save it as typed once confirmed: nothing that
 * could be real is refused. The ranges are the presets' (common practice, no source); unit
 * factors are exact (NIST Handbook 44, Appendix C: 1 cm = 10 mm, 1 kg = 1000 g).
 */
import { fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import {
  HarvestForm,
  MeasureForm,
  type QueuedEntry,
} from '../../src/features/field-log/components/entry-forms';

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
const trait = {
  key: 'x',
  direction: 'higher' as const,
  scaleMin: null,
  scaleMax: null,
  displayUnit: null,
};
const harvestMass = {
  ...trait,
  id: '00000000-0000-4000-8000-0000000000b1',
  key: 'marketable_yield',
  label: 'Marketable yield',
  quantityKind: 'mass' as const,
  basis: 'harvest' as const,
  plausibleMin: 0.5,
  plausibleMax: 5000,
};
const height = {
  ...trait,
  id: '00000000-0000-4000-8000-0000000000b2',
  key: 'plant_height',
  label: 'Plant height',
  quantityKind: 'length' as const,
  basis: 'plant' as const,
  direction: 'lower' as const,
  plausibleMin: 20,
  plausibleMax: 4000,
};

function setup(Form: typeof HarvestForm, traits: (typeof harvestMass | typeof height)[]) {
  const saved: QueuedEntry[][] = [];
  const onSave = vi.fn(async (entries: QueuedEntry[]) => {
    saved.push(entries);
  });
  render(
    <Form
      slug="brookfold"
      plot={plot}
      date="2026-07-01"
      units="metric"
      traits={traits as never}
      onSave={onSave}
    />,
  );
  return { saved, onSave };
}

const question = () => screen.findByRole('group', { name: 'Are you sure?' });

describe('the harvest form', () => {
  it('asks about 9,999 fruit weighing 5 g and saves them as typed once confirmed', async () => {
    const { saved, onSave } = setup(HarvestForm, [harvestMass]);
    fireEvent.change(screen.getByLabelText('Marketable count'), { target: { value: '9999' } });
    fireEvent.change(screen.getByLabelText('Marketable mass (g)'), { target: { value: '5' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));

    const ask = await question();
    expect(onSave).not.toHaveBeenCalled();
    expect(ask).toHaveProperty('ownerDocument.activeElement', ask);
    expect(
      within(ask)
        .getAllByRole('listitem')
        .map((li) => li.textContent),
    ).toEqual([
      'Marketable: 9,999 fruit in one harvest is outside the plausible 0–1,000.',
      'Marketable: 0.0005 g per fruit is outside the plausible 0.5–5,000 g per fruit.',
    ]);

    fireEvent.click(within(ask).getByRole('button', { name: 'Yes, save as typed' }));
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(1));
    expect(saved[0]!.map((e) => e.body)).toEqual([
      expect.objectContaining({ fruitCount: 9999, massG: 5, grade: 'marketable' }),
    ]);
    await waitFor(() => expect(screen.queryByRole('group', { name: 'Are you sure?' })).toBeNull());
  });

  it('saves an ordinary okra picking at once (24 pods, 410 g)', async () => {
    const { onSave } = setup(HarvestForm, [harvestMass]);
    fireEvent.change(screen.getByLabelText('Marketable count'), { target: { value: '24' } });
    fireEvent.change(screen.getByLabelText('Marketable mass (g)'), { target: { value: '410' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(1));
    expect(screen.queryByRole('group', { name: 'Are you sure?' })).toBeNull();
  });

  it('drops the question when a value changes, and asks again only if still in doubt', async () => {
    const { onSave } = setup(HarvestForm, [harvestMass]);
    fireEvent.change(screen.getByLabelText('Marketable count'), { target: { value: '9999' } });
    fireEvent.change(screen.getByLabelText('Marketable mass (g)'), { target: { value: '5' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    const ask = await question();
    fireEvent.click(within(ask).getByRole('button', { name: 'No, let me change it' }));
    expect(screen.queryByRole('group', { name: 'Are you sure?' })).toBeNull();
    await waitFor(() =>
      expect(document.activeElement).toBe(screen.getByLabelText('Marketable count')),
    );
    fireEvent.change(screen.getByLabelText('Marketable count'), { target: { value: '9' } });
    fireEvent.change(screen.getByLabelText('Marketable mass (g)'), { target: { value: '500' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    await waitFor(() => expect(onSave).toHaveBeenCalledTimes(1));
  });

  it('types the mass in the harvest trait’s own unit (kg) and checks it in g', async () => {
    const { saved } = setup(HarvestForm, [
      { ...harvestMass, displayUnit: 'kg' as never, plausibleMax: 40_000 },
    ]);
    // 1 pumpkin of 12.5 kg = 12,500 g: inside 0.5 g–40 kg.
    fireEvent.change(screen.getByLabelText('Marketable count'), { target: { value: '1' } });
    fireEvent.change(screen.getByLabelText('Marketable mass (kg)'), { target: { value: '12,5' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    await waitFor(() => expect(saved).toHaveLength(1));
    expect(saved[0]![0]!.body).toMatchObject({ fruitCount: 1, massG: 12_500 });
  });
});

describe('the measurement form', () => {
  it('asks about a height of 920 cm (meant as mm?) on a lower-is-better trait', async () => {
    const { saved, onSave } = setup(MeasureForm, [height]);
    fireEvent.change(screen.getByLabelText('Plant 1 (cm)'), { target: { value: '92' } });
    fireEvent.change(screen.getByLabelText('Plant 2 (cm)'), { target: { value: '920' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    const ask = await question();
    expect(onSave).not.toHaveBeenCalled();
    // 920 cm = 9,200 mm > 4,000 mm = 400 cm; 92 cm is inside 2–400 cm and not asked about.
    expect(
      within(ask)
        .getAllByRole('listitem')
        .map((li) => li.textContent),
    ).toEqual(['Plant 2: Plant height 920 cm is outside the plausible 2–400 cm.']);
    fireEvent.click(within(ask).getByRole('button', { name: 'Yes, save as typed' }));
    await waitFor(() => expect(saved).toHaveLength(1));
    expect(saved[0]!.map((e) => e.body)).toEqual([
      expect.objectContaining({ value: 920, plantNumber: 1 }),
      expect.objectContaining({ value: 9200, plantNumber: 2 }),
    ]);
  });

  it('drops the question when the unit changes (920 mm is plausible)', async () => {
    const { saved } = setup(MeasureForm, [height]);
    fireEvent.change(screen.getByLabelText('Plant 1 (cm)'), { target: { value: '920' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    await question();
    fireEvent.change(screen.getByLabelText('Unit'), { target: { value: 'mm' } });
    expect(screen.queryByRole('group', { name: 'Are you sure?' })).toBeNull();
    fireEvent.click(screen.getByRole('button', { name: 'Save' }));
    await waitFor(() => expect(saved).toHaveLength(1));
    expect(saved[0]![0]!.body).toMatchObject({ value: 920 });
  });
});
