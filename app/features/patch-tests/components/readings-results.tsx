import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { ICDRG_LABELS } from '#shared/domain/icdrg.ts';
import { CAST_PHOTO_MAX_BYTES } from '#shared/limits.ts';
import { READING_PATTERN_HINTS, READING_PATTERN_LABELS, READING_PATTERN_TERMS } from '#shared/domain/test-outcome.ts';
import { PatchTestDetailSchema, type PatchTestDetail } from '#shared/schemas/patch-test-log.ts';
import { FileField } from '../../../components/ui/file-field.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatBytes, formatDateTime } from '../../../lib/format.ts';
import { useUpload } from '../../../lib/upload.ts';
import { readingPhotoUrl, testWritten } from '../api.ts';

/** What each site showed at each reading, with notes and photos: health details, for the lead and the performer only. */
export function ReadingsResults({ test, canRecord }: { test: PatchTestDetail; canRecord: boolean }) {
  const points = test.schedule;
  return (
    <div className="flex flex-col gap-4">
      <Table caption="Readings per site" testId="readings-results">
        <Thead>
          <Tr>
            <Th>Site and product</Th>
            {points.map((p) => (
              <Th key={p.pointId}>{p.label}</Th>
            ))}
            <Th>Pattern (a hint, not a verdict)</Th>
          </Tr>
        </Thead>
        <tbody>
          {test.products.map((s) => (
            <Tr key={s.id}>
              <Td className="font-semibold">
                {s.site}
                <br />
                <span className="font-normal">{s.productName}</span>
              </Td>
              {points.map((p) => {
                const r = s.readings?.find((x) => x.pointId === p.pointId);
                return (
                  <Td key={p.pointId}>
                    {r ? (
                      <div className="flex flex-col gap-1">
                        <span className="text-lg font-bold">
                          {r.code} <span className="text-sm font-normal">{ICDRG_LABELS[r.code]}</span>
                        </span>
                        <span className="text-sm text-ink-700">
                          {formatDateTime(r.readAt)}
                          {r.late ? ' (late)' : ''}
                        </span>
                        {r.note ? <span className="text-sm">{r.note}</span> : null}
                        <div className="flex flex-wrap gap-1">
                          {r.photos.map((ph) => (
                            <a key={ph.id} href={readingPhotoUrl(test.id, ph.id, 'photo')}>
                              <img src={readingPhotoUrl(test.id, ph.id)} alt={`${s.site} at ${p.label}`} width={64} height={64} className="size-16 rounded border border-sand-300 object-cover" />
                            </a>
                          ))}
                        </div>
                        {canRecord ? <PhotoUpload testId={test.id} readingId={r.id} label={`Add a photo of ${s.site} at ${p.label}`} /> : null}
                      </div>
                    ) : (
                      '—'
                    )}
                  </Td>
                );
              })}
              <Td>
                {s.outcome ? (
                  <>
                    {READING_PATTERN_LABELS[s.outcome.pattern]}
                    {READING_PATTERN_TERMS[s.outcome.pattern] ? ` (${READING_PATTERN_TERMS[s.outcome.pattern]})` : ''}
                    {READING_PATTERN_HINTS[s.outcome.pattern] ? <p className="text-sm text-ink-700">{READING_PATTERN_HINTS[s.outcome.pattern]}</p> : null}
                  </>
                ) : (
                  '—'
                )}
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </div>
  );
}

function PhotoUpload({ testId, readingId, label }: { testId: string; readingId: string; label: string }) {
  const queryClient = useQueryClient();
  const upload = useUpload<PatchTestDetail>();
  const [problem, setProblem] = useState<string | null>(null);
  async function send(file: File) {
    setProblem(null);
    if (file.size > CAST_PHOTO_MAX_BYTES) return setProblem(`${formatBytes(file.size)} is over the ${formatBytes(CAST_PHOTO_MAX_BYTES)} limit.`);
    try {
      await testWritten(queryClient, await upload.start({ url: `/api/patch-tests/${encodeURIComponent(testId)}/readings/${encodeURIComponent(readingId)}/photos`, field: 'photo', file, schema: PatchTestDetailSchema }));
    } catch (err) {
      if (err instanceof DOMException) return;
      setProblem(isApiError(err) ? (err.fields.photo?.join(' ') ?? err.message) : 'The photo was not sent.');
    }
  }
  return (
    <div className="flex flex-col gap-1">
      <FileField label={label} accept="image/jpeg,image/png,image/webp,image/avif" onChange={(e) => e.target.files?.[0] && void send(e.target.files[0])} />
      {upload.state.status === 'uploading' ? <ProgressBar label="Uploading the photo" value={upload.state.progress} /> : null}
      {problem ? (
        <p role="alert" className="text-sm font-semibold text-brick-700">
          {problem}
        </p>
      ) : null}
    </div>
  );
}
