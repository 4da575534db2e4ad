// Which room a block was in, and how that room was run, on a given day. Dates are ISO "YYYY-MM-DD"
// strings, which compare in calendar order as strings.

/**
 * The regime in force on `isoDate`: the one with the latest `startsOn` on or before that day (a
 * regime holds from its first day until the next one starts); null before the room's first regime.
 */
export function regimeOn<R extends { startsOn: string }>(regimes: readonly R[], isoDate: string): R | null {
  let found: R | null = null;
  for (const regime of regimes) {
    if (regime.startsOn <= isoDate && (found === null || regime.startsOn > found.startsOn)) found = regime;
  }
  return found;
}

/**
 * The block's room on `isoDate`: the move with the latest `movedOn` on or before that day, else the
 * move dated null ("from the start of fruiting", as a season log's fruiting_room column says); null
 * when the block had not been moved into any room by then.
 */
export function roomOn<M extends { movedOn: string | null }>(moves: readonly M[], isoDate: string): M | null {
  let dated: M | null = null;
  let fromStart: M | null = null;
  for (const move of moves) {
    if (move.movedOn === null) fromStart = move;
    else if (move.movedOn <= isoDate && (dated === null || move.movedOn > (dated.movedOn ?? ""))) dated = move;
  }
  return dated ?? fromStart;
}
