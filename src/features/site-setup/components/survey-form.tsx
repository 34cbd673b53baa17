import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { SurveyCreateSchema, type SurveySettings, type ZoneSetSchema } from '@shared/schemas/survey-setup';
import { SPECIES } from '@shared/schemas/vocabulary';
import { formatLength, lengthTextSchema } from '@shared/units';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import type { Level } from '@shared/schemas/site';
import { useSite } from '../data/get-site';
import { useZoneSets } from '../data/list-zone-sets';
import { useSaveSurvey } from '../data/save-survey';
import { checkedBy, emptyToNull, reportFormError } from './form-errors';
import { QueryState } from './query-state';
import { SPECIES_LABELS } from './labels';
import { SelectField } from '@/components/select-field';

/**
 * The form's text boxes (the repeat radius typed with its unit, "30 cm"; the harmonic as text) turned
 * into numbers, then checked by the shared schema itself, cross-field rules included.
 */
const SurveyFormSchema = z
  .object({
    ...SurveyCreateSchema.shape,
    // One checkbox alone reads as its value (or false) rather than as a list.
    levelIds: z.preprocess((v) => (Array.isArray(v) ? v : typeof v === 'string' ? [v] : []), z.array(z.string())),
    repeatRadiusM: lengthTextSchema,
    maxHarmonic: z.coerce.number<string>().int('A whole number, please.'),
  })
  .transform(checkedBy(SurveyCreateSchema));
type SurveyFormInput = z.input<typeof SurveyFormSchema>;
/** "30.0000 cm" → "30 cm": the saved radius, shown for editing without toPrecision's padding zeros. */
function lengthForEditing(lengthM: number): string {
  return formatLength(lengthM, { significantDigits: 6 }).replace(/^(\d+)\.(\d*?)0+(?=\s)/, (_, whole: string, frac: string) => (frac ? `${whole}.${frac}` : whole));
}

type ZoneSet = z.infer<typeof ZoneSetSchema>;

const FIELDS = ['name', 'zoneSetId', 'levelIds', 'species', 'maxHarmonic', 'repeatRadiusM', 'startsOn', 'endsOn', 'notes'] as const;

/**
 * The zone sets must be on the screen before the form is: the <select> is uncontrolled, so options
 * that arrive later would leave it showing (and submitting) the wrong one.
 */
export function SurveyForm(props: { organisationId: string; siteId: string; survey?: SurveySettings; onSaved: (survey: SurveySettings) => void }) {
  const zoneSets = useZoneSets(props.organisationId);
  const site = useSite(props.organisationId, props.siteId);
  if (!zoneSets.data) return <QueryState label="zone sets" query={zoneSets} />;
  if (!site.data) return <QueryState label="the site's levels" query={site} />;
  return <SurveyFormFields {...props} zoneSets={zoneSets.data.zoneSets} levels={site.data.levels} />;
}

function SurveyFormFields({ organisationId, siteId, survey, onSaved, zoneSets, levels }: {
  organisationId: string;
  siteId: string;
  survey?: SurveySettings;
  onSaved: (survey: SurveySettings) => void;
  zoneSets: ZoneSet[];
  levels: Level[];
}) {
  // Archived levels are offered only when the survey already walks them, so they can be kept.
  const levelChoices = levels.filter((l) => !l.archived || survey?.levelIds.includes(l.id));
  const save = useSaveSurvey(organisationId, siteId);
  // The server reads a null zone set as "none" (stations get no safety lines), not as "the default",
  // so a new survey starts on the organisation's default set and "none" is offered only when it is
  // already the case or there is no set to choose.
  const defaultZoneSetId = zoneSets.find((z) => z.isDefault)?.id ?? zoneSets[0]?.id ?? null;
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<SurveyFormInput, unknown, z.output<typeof SurveyFormSchema>>({
    resolver: zodResolver(SurveyFormSchema),
    defaultValues: {
      name: survey?.name ?? '',
      zoneSetId: survey ? survey.zoneSetId : defaultZoneSetId,
      levelIds: survey ? survey.levelIds : levelChoices.map((l) => l.id),
      species: survey?.species ?? ['electron', 'proton'],
      maxHarmonic: String(survey?.maxHarmonic ?? 3),
      repeatRadiusM: survey ? lengthForEditing(survey.repeatRadiusM) : '30 cm',
      startsOn: survey?.startsOn ?? new Date().toISOString().slice(0, 10),
      endsOn: survey?.endsOn ?? null,
      notes: survey?.notes ?? null,
    },
  });
  const offerNone = zoneSets.length === 0 || (survey !== undefined && survey.zoneSetId === null);
  const zoneOptions = [
    ...(offerNone ? [{ value: '', label: 'None: stations are not classed against safety lines' }] : []),
    ...zoneSets.map((z) => ({ value: z.id, label: `${z.name.includes(z.edition) ? z.name : `${z.name} (${z.edition})`}${z.isDefault ? ', the organisation’s default' : ''}` })),
  ];
  return (
    <form
      noValidate
      aria-label={survey ? 'Survey settings' : 'New survey'}
      className="grid grid-cols-1 gap-4 sm:grid-cols-2"
      onSubmit={handleSubmit((values) =>
        save.mutate({ surveyId: survey?.id, body: values }, { onSuccess: onSaved, onError: (error) => reportFormError(error, setError, FIELDS) }),
      )}
    >
      <Field label="Survey name" placeholder="2027 annual fringe-field check" className="sm:col-span-2" error={errors.name?.message} {...register('name')} />
      <SelectField label="Zone set" className="sm:col-span-2" hint="The safety lines stations are classed against" options={zoneOptions} error={errors.zoneSetId?.message} {...register('zoneSetId', { setValueAs: emptyToNull })} />
      <Field label="Start date" type="date" error={errors.startsOn?.message} {...register('startsOn', { setValueAs: emptyToNull })} />
      <Field label="End date (optional)" type="date" error={errors.endsOn?.message} {...register('endsOn', { setValueAs: emptyToNull })} />
      <Field label="Repeat-reading radius" hint="Readings closer than this are repeats: 30 cm, 0.5 m" autoComplete="off" error={errors.repeatRadiusM?.message} {...register('repeatRadiusM')} />
      <Field label="Highest harmonic to predict" type="number" inputMode="numeric" min={1} max={50} error={errors.maxHarmonic?.message} {...register('maxHarmonic')} />
      <fieldset className="flex flex-col gap-1 sm:col-span-2" aria-describedby={errors.levelIds ? 'levels-error' : 'levels-hint'}>
        <legend className="font-bold">Levels to survey</legend>
        <p id="levels-hint" className="text-sm text-fg-muted">
          Surveyors take only these levels' plans and rooms offline. A level added to the site later is not in this survey until you tick it here.
        </p>
        {levelChoices.length === 0 ? (
          <p className="text-sm font-bold">This site has no levels yet: add a level (with its plan) to the site first.</p>
        ) : (
          <div className="flex flex-wrap gap-2">
            {levelChoices.map((level) => (
              <label key={level.id} className="inline-flex min-h-touch items-center gap-2 rounded-lg border-2 border-field-border px-3">
                <input type="checkbox" value={level.id} className="h-6 w-6 accent-accent" {...register('levelIds')} />
                {level.name}
                {level.archived ? ' (archived)' : ''}
              </label>
            ))}
          </div>
        )}
        {errors.levelIds && (
          <p id="levels-error" className="text-sm font-bold text-danger">
            {errors.levelIds.message}
          </p>
        )}
      </fieldset>
      <fieldset className="flex flex-col gap-1 sm:col-span-2" aria-describedby={errors.species ? 'species-error' : undefined}>
        <legend className="font-bold">Species whose lines are predicted</legend>
        <div className="flex flex-wrap gap-2">
          {SPECIES.map((species) => (
            <label key={species} className="inline-flex min-h-touch items-center gap-2 rounded-lg border-2 border-field-border px-3">
              <input type="checkbox" value={species} className="h-6 w-6 accent-accent" {...register('species')} />
              {SPECIES_LABELS[species]}
            </label>
          ))}
        </div>
        {errors.species && (
          <p id="species-error" className="text-sm font-bold text-danger">
            {errors.species.message}
          </p>
        )}
      </fieldset>
      <Field label="Notes (optional)" className="sm:col-span-2" error={errors.notes?.message} {...register('notes', { setValueAs: emptyToNull })} />
      <div className="sm:col-span-2">
        <Button type="submit" busy={save.isPending} busyLabel="Saving…">
          {survey ? 'Save settings' : 'Create survey'}
        </Button>
      </div>
    </form>
  );
}
