/** The state of one form's conflict: kept when a save answers 409, compared with `compareVersions`. */
import { useMemo, useState } from 'react';
import { isStale } from './api';
import { compareVersions, type Conflict, type IsLeaf } from './conflict';

export interface OpenConflict<V, R, S> extends Conflict<S> {
  /** What the failed save was based on, and what it held. */
  base: V;
  mine: V;
  /** The record as the API answered it with the 409, and its shape. */
  current: R;
  theirs: S;
  /** The version the re-apply is sent with. */
  version: number;
}

/**
 * `take(error, base, mine)` after a failed save: true (and the conflict is shown) when the error was a 409
 * with the current record. `shapeOf` turns a form value and the current record alike into the shape compared.
 */
export function useConflict<V, R extends { version: number }, S = V>(shapeOf: (value: V | R) => S, isLeaf?: IsLeaf) {
  const [state, setState] = useState<{ base: V; mine: V; current: R } | null>(null);
  const conflict = useMemo<OpenConflict<V, R, S> | null>(() => {
    if (!state) return null;
    const theirs = shapeOf(state.current);
    return { ...state, theirs, version: state.current.version, ...compareVersions(shapeOf(state.base), shapeOf(state.mine), theirs, isLeaf) };
  }, [state]); // eslint-disable-line react-hooks/exhaustive-deps
  return {
    conflict,
    take(error: unknown, base: V, mine: V): boolean {
      if (!isStale(error)) return false;
      setState({ base, mine, current: error.body.current as unknown as R });
      return true;
    },
    clear: () => setState(null),
  };
}
