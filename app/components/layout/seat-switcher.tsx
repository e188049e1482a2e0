import { useId } from 'react';
import { errorMessage } from '../../lib/api-client.ts';
import { controlClasses } from '../ui/field.tsx';
import { useSelectSeat } from '../../lib/session/api.ts';
import { useSession } from '../../lib/session/session-context.tsx';
import { seatKey, seatLabel } from '../../lib/session/seat.ts';

/** "Acting as": one option per seat the person holds; switching reloads every screen's data. */
export function SeatSwitcher({ className = '' }: { className?: string }) {
  const session = useSession();
  const selectSeat = useSelectSeat();
  const id = useId();
  const errorId = `${id}-error`;
  const current = session.current ? seatKey(session.current) : '';

  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-sm font-semibold text-graphite-900">
        Acting as
      </label>
      <select
        id={id}
        className={`${controlClasses} sm:min-w-64`}
        value={current}
        // Not disabled while switching: a disabled select drops keyboard focus. A second change waits instead.
        aria-describedby={selectSeat.isError ? errorId : undefined}
        aria-busy={selectSeat.isPending || undefined}
        data-testid="seat-switcher"
        onChange={(e) => {
          const seat = session.seats.find((s) => seatKey(s) === e.target.value);
          if (seat && !selectSeat.isPending) selectSeat.mutate({ productionId: seat.productionId, role: seat.role });
        }}
      >
        {session.seats.map((seat) => (
          <option key={seatKey(seat)} value={seatKey(seat)}>
            {seatLabel(seat)}
          </option>
        ))}
      </select>
      {selectSeat.isError ? (
        <p id={errorId} role="alert" className="text-sm font-semibold text-brick-700">
          {errorMessage(selectSeat.error)}
        </p>
      ) : null}
    </div>
  );
}
