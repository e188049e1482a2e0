import type { Production } from '#shared/schemas/admin.ts';
import { formatDate } from '../../../lib/format.ts';

export function DateRange({ startsOn, endsOn }: Pick<Production, 'startsOn' | 'endsOn'>) {
  if (!startsOn && !endsOn) return <span className="text-ink-600">No dates</span>;
  return (
    <span className="whitespace-nowrap">
      {startsOn ? <time dateTime={startsOn}>{formatDate(startsOn)}</time> : 'Open start'}
      {' – '}
      {endsOn ? <time dateTime={endsOn}>{formatDate(endsOn)}</time> : 'open end'}
    </span>
  );
}
