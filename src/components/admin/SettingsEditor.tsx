// The course settings for a director to change (react-hook-form with the contract's zod schema),
// or to read for an attending. Only the values changed are sent, with the version they were
// changed from; a change someone else saved first is shown and reloaded, never overwritten.
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { Clinic } from '../../lib/present/format';
import {
  settingsFormSchema,
  type SettingName,
  type SettingsAnswer,
  type SettingValues,
  type StaleSettingsAnswer,
} from '../../lib/settings-contract';
import type { SettingRowView } from '../../lib/settings-contract';
import { RecomputePanel } from './RecomputePanel';
import { jsonWrite, requestId, send } from './requests';

interface Props {
  rows: SettingRowView[];
  version: number;
  canEdit: boolean;
  clinic: Clinic;
}

const GROUPS: { group: SettingRowView['group']; title: string }[] = [
  { group: 'tolerance', title: 'Tolerances of the checks' },
  { group: 'requirement', title: 'Graduation requirements' },
  { group: 'policy', title: 'Other school policies' },
];

const valuesOf = (a: SettingsAnswer | SettingRowView[]): SettingValues =>
  (Array.isArray(a)
    ? Object.fromEntries(a.map((r) => [r.name, r.value]))
    : Object.fromEntries(Object.entries(a).filter(([k]) => k !== 'version'))) as SettingValues;

type Conflict = { version: number; mine: Partial<SettingValues> };

export function SettingsEditor({ rows, version: loaded, canEdit, clinic }: Props) {
  const [version, setVersion] = useState(loaded);
  const [status, setStatus] = useState<string | null>(null);
  const [failure, setFailure] = useState<string | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [saves, setSaves] = useState(0);
  const form = useForm<SettingValues>({
    resolver: zodResolver(settingsFormSchema),
    defaultValues: valuesOf(rows),
    mode: 'onBlur',
  });
  const { register, handleSubmit, formState, reset, setError } = form;

  async function save(values: SettingValues) {
    setStatus(null);
    setFailure(null);
    const dirty = Object.keys(formState.dirtyFields) as SettingName[];
    const changes = Object.fromEntries(dirty.map((n) => [n, values[n]])) as Partial<SettingValues>;
    if (dirty.length === 0) {
      setStatus('Nothing to save: no value was changed.');
      return;
    }
    const reply = await send<SettingsAnswer>(
      '/api/settings',
      jsonWrite('PUT', { id: requestId(), values: changes }, { 'If-Match': `"${version}"` }),
    );
    if (reply.ok) {
      setVersion(reply.body.version);
      reset(valuesOf(reply.body));
      setStatus(
        `Saved as version ${reply.body.version}. The canals of cases not signed off are being judged again with it.`,
      );
      setSaves((n) => n + 1);
      return;
    }
    if (reply.status === 409 && reply.body.code === 'stale') {
      setConflict({ version: (reply.body as unknown as StaleSettingsAnswer).version, mine: changes });
      return;
    }
    if (reply.status === 400 && reply.field && reply.field in values) {
      setError(reply.field as SettingName, { type: 'server', message: reply.error }, { shouldFocus: true });
      return;
    }
    setFailure(reply.error);
  }

  async function reload() {
    const reply = await send<SettingsAnswer>('/api/settings');
    if (!reply.ok) {
      setFailure(reply.error);
      return;
    }
    setVersion(reply.body.version);
    reset(valuesOf(reply.body));
    setConflict(null);
    setStatus(`Reloaded version ${reply.body.version}. Make your change again if it is still needed.`);
  }

  const labelOf = (name: string) => rows.find((r) => r.name === name)?.label ?? name;
  return (
    <>
      <form onSubmit={(e) => void handleSubmit(save)(e)} noValidate aria-describedby="settings-version">
        <p id="settings-version" className="text-muted mb-4">
          Version {version} of the settings.
        </p>
        {conflict && (
          <div
            role="alert"
            className="border-2 border-stop bg-white rounded-lg p-4 mb-4"
            data-testid="settings-conflict"
          >
            <p className="font-bold text-stop mb-2">
              Someone changed the settings since you loaded them (now version {conflict.version}). Nothing of yours was
              saved.
            </p>
            <p className="mb-2">Your changes, to make again after reloading if still needed:</p>
            <ul className="list-disc pl-6 mb-3">
              {Object.entries(conflict.mine).map(([name, value]) => (
                <li key={name}>
                  {labelOf(name)}: {String(value)}
                </li>
              ))}
            </ul>
            <button
              type="button"
              onClick={() => void reload()}
              className="bg-ink text-white font-bold rounded px-4 py-3 min-h-12"
            >
              Reload the settings
            </button>
          </div>
        )}
        {GROUPS.map(({ group, title }) => {
          const inGroup = rows.filter((r) => r.group === group);
          if (inGroup.length === 0) return null;
          return (
            <section key={group} aria-labelledby={`${group}-h`} className="mb-6">
              <h2 id={`${group}-h`} className="text-xl font-bold mb-2">
                {title}
              </h2>
              <div className="overflow-x-auto bg-white border border-line rounded-lg">
                <table className="w-full text-left border-collapse">
                  <thead className="bg-paper">
                    <tr>
                      <th scope="col" className="p-3">
                        Setting
                      </th>
                      <th scope="col" className="p-3">
                        Value
                      </th>
                      <th scope="col" className="p-3">
                        Range
                      </th>
                      <th scope="col" className="p-3">
                        Default
                      </th>
                      <th scope="col" className="p-3">
                        Source
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {inGroup.map((r) => {
                      const error = formState.errors[r.name]?.message;
                      const errorId = `${r.name}-error`;
                      return (
                        <tr key={r.name} className="border-t border-line align-top" data-setting={r.name}>
                          <th scope="row" className="p-3 font-normal">
                            {canEdit ? (
                              <label htmlFor={r.name} className="font-bold block">
                                {r.label}
                              </label>
                            ) : (
                              <span className="font-bold block">{r.label}</span>
                            )}
                            <code className="text-sm text-muted">{r.name}</code>
                          </th>
                          <td className="p-3 min-w-40">
                            {!canEdit ? (
                              <span>{r.yesNo ? (r.value === 1 ? 'yes' : 'no') : `${r.value} ${r.unit}`}</span>
                            ) : r.yesNo ? (
                              <select
                                id={r.name}
                                className="border-2 border-edge rounded px-3 py-2 min-h-12 bg-white"
                                aria-invalid={error ? true : undefined}
                                aria-describedby={errorId}
                                {...register(r.name, { setValueAs: (v: unknown) => Number(v) })}
                              >
                                <option value="0">No</option>
                                <option value="1">Yes</option>
                              </select>
                            ) : (
                              <span className="flex items-center gap-2">
                                <input
                                  id={r.name}
                                  type="number"
                                  inputMode="decimal"
                                  step={r.step}
                                  min={r.min}
                                  max={r.max}
                                  className="border-2 border-edge rounded px-3 py-2 min-h-12 w-28 bg-white"
                                  aria-invalid={error ? true : undefined}
                                  aria-describedby={errorId}
                                  {...register(r.name, { valueAsNumber: true })}
                                />
                                <span>{r.unit}</span>
                              </span>
                            )}
                            {canEdit && (
                              <span id={errorId} className="block text-stop" data-error-for={r.name}>
                                {error}
                              </span>
                            )}
                          </td>
                          <td className="p-3 whitespace-nowrap">{r.range}</td>
                          <td className="p-3 whitespace-nowrap">{r.defaultText}</td>
                          <td className="p-3">
                            {r.source}
                            {r.sourceNote && (
                              <details className="mt-1">
                                <summary className="underline cursor-pointer">Why this default</summary>
                                <p className="text-sm mt-1">{r.sourceNote}</p>
                              </details>
                            )}
                          </td>
                        </tr>
                      );
                    })}
                  </tbody>
                </table>
              </div>
            </section>
          );
        })}
        {canEdit && (
          <div className="flex flex-wrap gap-4 items-center">
            <button
              type="submit"
              disabled={formState.isSubmitting}
              className="bg-gutta-strong text-white font-bold rounded px-4 py-3 text-lg min-h-12 disabled:opacity-60"
            >
              Save the changed values
            </button>
            <button
              type="button"
              onClick={() => reset()}
              className="underline min-h-12 px-2"
              disabled={!formState.isDirty}
            >
              Undo my edits
            </button>
          </div>
        )}
        <p role="status" className="mt-3 min-h-6" data-testid="settings-status">
          {status}
        </p>
        {failure && (
          <p role="alert" className="text-stop">
            {failure}
          </p>
        )}
      </form>
      {canEdit && <RecomputePanel clinic={clinic} watch={saves} />}
    </>
  );
}
