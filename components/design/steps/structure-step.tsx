'use client';

import { useFieldArray } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Options } from '../options';
import { SelectField, TextField } from '@/components/ui/field';
import { LEVEL_KIND_WORDS } from '@/lib/design/fields';
import { GROUPING_TYPES, MAX_LEVELS, structureSchema } from '@/lib/design/schema';
import { asNumber, asOptional, errorAt, makeId, useStepForm } from '../step-form';
import type { StepProps } from './types';

const KIND_HELP: Record<string, string> = {
  independent: 'Units that do not share anything that matters for the outcome, e.g. volunteers, pupils, plants.',
  grouping: 'A group of units that share something: a classroom, tray, litter, cage, site or family. Units in one group tend to be alike.',
  repeated: 'The same unit measured again over time: nights, visits, weeks. Measurements of one unit are not independent.',
  replicate: 'Technical replicates or sub-samples of one sample: leaves of a plant, wells of one sample. They measure the same unit again.',
};

export function StructureStep({ value, onValid, onDraft, disabled }: StepProps<'structure'>) {
  const form = useStepForm(structureSchema, value, onValid, onDraft);
  const { register, formState, control, watch } = form;
  const e = formState.errors as Record<string, unknown>;
  const levels = useFieldArray({ control, name: 'levels', keyName: '_key' as 'id' });
  const crossed = useFieldArray({ control, name: 'crossedFactors', keyName: '_key' as 'id' });
  const current = watch('levels') ?? [];

  function addLevel() {
    const name = current.length === 0 ? 'Unit' : 'Measurement';
    levels.append({ id: makeId(`${name}-${current.length + 1}`, current.map((l) => l.id)), name, kind: current.length === 0 ? 'independent' : 'repeated', count: current.length === 0 ? 20 : 2, countIsTotal: false, countCv: 0, sharedEnvironment: false, spatialOrSerial: false });
  }

  return (
    <fieldset disabled={disabled} className="space-y-4">
      <legend className="sr-only">Structure</legend>
      <p className="text-sm text-muted">
        List the levels from the top down, e.g. classroom → pupil → occasion. The top level’s number is the total in the study (all arms together); each lower level’s
        number is per unit of the level above. The outcome is measured at the bottom level.
      </p>
      <ol className="space-y-3">
        {levels.fields.map((f, i) => {
          const kind = current[i]?.kind;
          const parent = current[i - 1]?.name;
          return (
            <li key={(f as unknown as { _key: string })._key} className="rounded-md border border-line bg-white p-3">
              <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
                <h3 className="text-sm font-bold">
                  Level {i + 1}
                  {i === 0 ? ' (top)' : ''}
                </h3>
                <div className="flex gap-1">
                  <Button variant="ghost" disabled={i === 0} onClick={() => levels.move(i, i - 1)}>
                    Move up<span className="sr-only"> level {i + 1}</span>
                  </Button>
                  <Button variant="ghost" disabled={i === levels.fields.length - 1} onClick={() => levels.move(i, i + 1)}>
                    Move down<span className="sr-only"> level {i + 1}</span>
                  </Button>
                  <Button variant="ghost" onClick={() => levels.remove(i)}>
                    Remove<span className="sr-only"> level {i + 1}</span>
                  </Button>
                </div>
              </div>
              <div className="grid gap-3 @md:grid-cols-2 @2xl:grid-cols-3">
                <TextField label="Name" {...register(`levels.${i}.name`)} error={errorAt(e, `levels.${i}.name`)} />
                <SelectField label="Kind of level" help={kind ? KIND_HELP[kind] : undefined} {...register(`levels.${i}.kind`)}>
                  <Options words={LEVEL_KIND_WORDS} />
                </SelectField>
                <TextField
                  label={i === 0 ? 'Number in the study' : `Number per ${parent ?? 'parent'}`}
                  type="number"
                  min={1}
                  {...register(`levels.${i}.count`, asNumber)}
                  error={errorAt(e, `levels.${i}.count`)}
                />
                {kind === 'grouping' && (
                  <SelectField label="Type of group" {...register(`levels.${i}.groupingType`, asOptional)}>
                    <option value="">Choose…</option>
                    {GROUPING_TYPES.map((g) => (
                      <option key={g} value={g}>
                        {g}
                      </option>
                    ))}
                  </SelectField>
                )}
                {i > 0 && (
                  <TextField
                    label="Variation of that number (CV)"
                    type="number"
                    step="any"
                    min={0}
                    help="0 when every parent has the same number; 0.4 when sizes vary a lot. Unequal sizes raise the design effect."
                    {...register(`levels.${i}.countCv`, asNumber)}
                    error={errorAt(e, `levels.${i}.countCv`)}
                  />
                )}
              </div>
              <div className="mt-2 flex flex-wrap gap-6 text-sm">
                <label className="flex items-center gap-2">
                  <input type="checkbox" {...register(`levels.${i}.sharedEnvironment`)} /> Units share an environment (cage, tank, tray, pot, room)
                </label>
                <label className="flex items-center gap-2">
                  <input type="checkbox" {...register(`levels.${i}.spatialOrSerial`)} /> Units are close in space or time (neighbouring plots, consecutive days)
                </label>
              </div>
            </li>
          );
        })}
      </ol>
      {typeof errorAt(e, 'levels') === 'string' && <p className="text-sm text-danger">{errorAt(e, 'levels')}</p>}
      <Button variant="secondary" onClick={addLevel} disabled={levels.fields.length >= MAX_LEVELS}>
        Add a level
      </Button>

      <div className="space-y-2 border-t border-line pt-4">
        <h3 className="text-sm font-semibold">Crossed factors</h3>
        <p className="text-sm text-muted">A factor whose every level meets every unit of a level, e.g. each rater scores every pupil.</p>
        {crossed.fields.map((f, i) => (
          <div key={(f as unknown as { _key: string })._key} className="grid gap-2 @md:grid-cols-2 @2xl:grid-cols-4">
            <TextField label="Name" {...register(`crossedFactors.${i}.name`)} error={errorAt(e, `crossedFactors.${i}.name`)} />
            <TextField label="How many" type="number" min={1} {...register(`crossedFactors.${i}.count`, asNumber)} />
            <SelectField label="Crossed with" {...register(`crossedFactors.${i}.crossedWithLevelId`)}>
              {current.map((l) => (
                <option key={l.id} value={l.id}>
                  {l.name}
                </option>
              ))}
            </SelectField>
            <div className="flex items-end">
              <Button variant="ghost" onClick={() => crossed.remove(i)}>
                Remove<span className="sr-only"> crossed factor {i + 1}</span>
              </Button>
            </div>
          </div>
        ))}
        <Button
          variant="secondary"
          disabled={current.length === 0}
          onClick={() => crossed.append({ id: makeId(`factor-${crossed.fields.length + 1}`, []), name: 'Rater', count: 2, crossedWithLevelId: current[current.length - 1]!.id })}
        >
          Add a crossed factor
        </Button>
      </div>
    </fieldset>
  );
}
