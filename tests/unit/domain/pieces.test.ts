import { describe, expect, it } from 'vitest';
import { DEFAULT_PIECES_PER_DAY, piecesRemaining, piecesShortfall } from '#shared/domain/pieces.ts';

describe('piecesRemaining', () => {
  it('takes the pieces worn and the pieces spoiled from those made', () => {
    expect(piecesRemaining({ made: 20, used: 6, spoiled: 2 })).toBe(12);
    expect(piecesRemaining({ made: 4, used: 4, spoiled: 0 })).toBe(0);
  });
});

describe('piecesShortfall', () => {
  it('falls short when the pieces left are fewer than the shoot days plus a spare a day', () => {
    // 10 days × 1 piece + 10 days × 1 spare = 20 needed; 12 left
    expect(piecesShortfall(12, 10, { kind: 'perDay', sparesPerDay: 1 })).toEqual({ needed: 20, remaining: 12, shortBy: 8, short: true });
  });

  it('is covered when the pieces left exactly meet the days and a set number of spares', () => {
    expect(piecesShortfall(12, 10, { kind: 'total', spares: 2 })).toEqual({ needed: 12, remaining: 12, shortBy: 0, short: false });
  });

  it('is covered with pieces to spare', () => {
    expect(piecesShortfall(30, 10, { kind: 'total', spares: 2 })).toMatchObject({ shortBy: 0, short: false });
  });

  it('falls short by one when a single spare is missing', () => {
    expect(piecesShortfall(11, 10, { kind: 'total', spares: 2 })).toMatchObject({ shortBy: 1, short: true });
  });

  it('counts one piece a shoot day unless more are worn each day', () => {
    // common practice, no published source
    expect(DEFAULT_PIECES_PER_DAY).toBe(1);
    // 5 days × 2 pieces + 3 spares = 13
    expect(piecesShortfall(12, 5, { kind: 'total', spares: 3 }, 2)).toMatchObject({ needed: 13, shortBy: 1, short: true });
  });

  it('needs only the spares when no shoot days are planned', () => {
    expect(piecesShortfall(0, 0, { kind: 'total', spares: 0 })).toMatchObject({ needed: 0, short: false });
    expect(piecesShortfall(0, 0, { kind: 'perDay', sparesPerDay: 3 })).toMatchObject({ needed: 0, short: false });
  });
});
