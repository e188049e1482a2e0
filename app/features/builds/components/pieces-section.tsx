import { useState } from 'react';
import type { PieceStatus } from '#shared/domain/builds.ts';
import type { BuildDetail } from '#shared/schemas/builds.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConflictNotice } from '../../../components/ui/conflict-notice.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useMarkPiece } from '../api.ts';
import { PieceStatusBadge } from './piece-status.tsx';

const NEXT: Record<PieceStatus, PieceStatus[]> = { on_hand: ['used', 'spoiled'], used: ['on_hand'], spoiled: ['on_hand'] };
const VERB: Record<PieceStatus, string> = { on_hand: 'Back on the shelf', used: 'Used', spoiled: 'Spoiled' };

/** Each piece of the run, and (for those who record builds) marking one used, spoiled or back on the shelf. */
export function PiecesSection({ build, onReload }: { build: BuildDetail; onReload: () => void }) {
  const markPiece = useMarkPiece();
  const [problem, setProblem] = useState<unknown>(null);
  const t = build.tally;
  const mark = async (pieceId: string, status: PieceStatus, version: number) => {
    setProblem(null);
    try {
      await markPiece.mutateAsync({ pieceId, status, version });
    } catch (err) {
      setProblem(err);
    }
  };
  return (
    <Section title="Pieces" testId="pieces">
      <p className="text-lg" data-testid="tally">
        {t.made} made · {t.used} used · {t.spoiled} spoiled · <strong>{t.remaining} on the shelf</strong>
      </p>
      {problem && isApiError(problem, 409) ? (
        <ConflictNotice
          error={problem}
          onReload={() => {
            setProblem(null);
            onReload();
          }}
        />
      ) : problem ? (
        <ErrorBanner error={problem} />
      ) : null}
      {build.pieces.length ? (
        <Table caption={`Pieces of this run (${t.made})`} captionHidden testId="pieces-table">
          <Thead>
            <tr>
              <Th>Piece</Th>
              <Th>State</Th>
              <Th>Marked</Th>
              {build.canManage ? <Th>Mark as</Th> : null}
            </tr>
          </Thead>
          <tbody>
            {build.pieces.map((p) => (
              <Tr key={p.id}>
                <Td className="font-semibold">{p.number}</Td>
                <Td>
                  <PieceStatusBadge status={p.status} />
                  {p.note ? <p className="mt-1 text-sm text-ink-700">{p.note}</p> : null}
                </Td>
                <Td className="text-sm text-ink-700">{p.statusAt ? `${formatDateTime(p.statusAt)}${p.statusBy ? `, ${p.statusBy}` : ''}` : '—'}</Td>
                {build.canManage ? (
                  <Td>
                    <div className="flex flex-wrap gap-2">
                      {NEXT[p.status].map((s) => (
                        <Button
                          key={s}
                          variant="secondary"
                          aria-label={`${VERB[s]} (piece ${p.number})`}
                          pending={markPiece.isPending && markPiece.variables?.pieceId === p.id && markPiece.variables.status === s}
                          onClick={() => void mark(p.id, s, p.version)}
                        >
                          {VERB[s]}
                        </Button>
                      ))}
                    </div>
                  </Td>
                ) : null}
              </Tr>
            ))}
          </tbody>
        </Table>
      ) : (
        <p className="text-ink-700">No pieces are recorded for this run.</p>
      )}
    </Section>
  );
}
