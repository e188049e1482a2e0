import { useEffect, useId, useRef, useState } from 'react';
import type { SessionSeat } from '#shared/schemas/session.ts';
import { errorMessage } from '../../lib/api-client.ts';
import { useSelectSeat } from '../../lib/session/api.ts';
import { useSession } from '../../lib/session/session-context.tsx';
import { seatKey, seatLabel } from '../../lib/session/seat.ts';
import { SignOutButton } from './sign-out-button.tsx';
import { EmailAddress } from '../ui/email-address.tsx';

function initials(name: string): string {
  const words = name.trim().split(/\s+/).filter(Boolean);
  return ((words[0]?.[0] ?? '') + (words.length > 1 ? (words.at(-1)?.[0] ?? '') : '')).toUpperCase() || '?';
}

/** "The Lantern Keeper · Department head": the production and role the person acts in now. */
export function seatContext(seat: SessionSeat | null): string {
  return seat ? seatLabel(seat).replace(' — ', ' · ') : '';
}

/**
 * The header's one control for who you are: your name and the production and role you act in,
 * opening to switch between them (when you hold more than one) and to sign out. A performer sees
 * only their name and "Sign out": no staff words, no list with one choice.
 */
export function AccountControl() {
  const session = useSession();
  const selectSeat = useSelectSeat();
  const [open, setOpen] = useState(false);
  const panelId = useId();
  const legendId = useId();
  const rootRef = useRef<HTMLDivElement>(null);
  const buttonRef = useRef<HTMLButtonElement>(null);
  const seat = session.current;
  const performerOnly = session.seats.length > 0 && session.seats.every((s) => s.role === 'performer');
  const choices = session.seats.length > 1 ? session.seats : [];
  const current = seat ? seatKey(seat) : '';

  useEffect(() => {
    if (!open) return;
    const away = (e: PointerEvent) => {
      if (rootRef.current && !rootRef.current.contains(e.target as Node)) setOpen(false);
    };
    const escape = (e: KeyboardEvent) => {
      if (e.key !== 'Escape') return;
      setOpen(false);
      buttonRef.current?.focus();
    };
    document.addEventListener('pointerdown', away);
    document.addEventListener('keydown', escape);
    return () => {
      document.removeEventListener('pointerdown', away);
      document.removeEventListener('keydown', escape);
    };
  }, [open]);

  return (
    <div ref={rootRef} className="relative min-w-0" data-testid="account-control">
      <button
        ref={buttonRef}
        type="button"
        aria-expanded={open}
        aria-controls={panelId}
        onClick={() => setOpen((o) => !o)}
        className="flex min-h-12 max-w-full items-center gap-3 rounded-xl border border-graphite-500 bg-white py-1.5 pr-3 pl-1.5 text-left hover:bg-plaster-100"
      >
        <span aria-hidden="true" className="flex size-10 shrink-0 items-center justify-center rounded-full bg-verdigris-100 font-bold text-verdigris-900">
          {initials(session.user.displayName)}
        </span>
        <span className="flex min-w-0 flex-col leading-tight">
          <span className="truncate font-semibold text-graphite-900" data-testid="user-name">
            {session.user.displayName}
          </span>
          {!performerOnly && seat ? (
            <span className="truncate text-sm text-graphite-700" data-testid="acting-context">
              {seatContext(seat)}
            </span>
          ) : null}
        </span>
        <span aria-hidden="true" className="shrink-0 text-graphite-600">
          {open ? '▴' : '▾'}
        </span>
      </button>
      <div
        id={panelId}
        hidden={!open}
        className="absolute right-0 z-40 mt-2 flex w-[min(24rem,calc(100vw-2rem))] flex-col gap-4 rounded-xl border border-plaster-300 bg-white p-4 shadow-lg"
      >
        <p className="text-sm text-graphite-700">
          Signed in as <span className="font-semibold text-graphite-900">{session.user.displayName}</span>
          <EmailAddress value={session.user.email} className="block" />
        </p>
        {choices.length > 0 ? (
          <fieldset className="flex flex-col gap-1" aria-describedby={selectSeat.isError ? `${panelId}-error` : undefined}>
            <legend id={legendId} className="mb-1 font-semibold text-graphite-900">
              Acting as
            </legend>
            {choices.map((s) => {
              const key = seatKey(s);
              return (
                <label key={key} className="flex min-h-11 cursor-pointer items-center gap-3 rounded-lg px-2 hover:bg-plaster-100 has-[:checked]:bg-verdigris-50">
                  <input
                    type="radio"
                    name={`${panelId}-seat`}
                    value={key}
                    checked={key === current}
                    className="size-5 shrink-0 accent-verdigris-700"
                    onChange={() => {
                      if (selectSeat.isPending) return;
                      selectSeat.mutate({ productionId: s.productionId, role: s.role }, { onSuccess: () => setOpen(false) });
                    }}
                  />
                  <span>{seatLabel(s)}</span>
                </label>
              );
            })}
            {selectSeat.isError ? (
              <p id={`${panelId}-error`} role="alert" className="text-sm font-semibold text-brick-700">
                {errorMessage(selectSeat.error)}
              </p>
            ) : null}
          </fieldset>
        ) : null}
        <SignOutButton className="w-full" />
      </div>
    </div>
  );
}
