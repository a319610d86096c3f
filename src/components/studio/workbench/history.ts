/**
 * The scenario being edited, with undo and redo. Every change is a whole new
 * document (the old one is kept by reference, so undo is cheap); changes that
 * arrive in quick succession with the same label (typing in one field) merge
 * into one undo step.
 */
import { useCallback, useMemo, useReducer } from 'react';
import type { Scenario } from '../../../lib/scenario';

const LIMIT = 200;
const MERGE_MS = 1_200;

type Entry = { document: Scenario; label: string; at: number };
type State = { past: Entry[]; present: Entry; future: Entry[]; saved: Scenario };

type Event =
  | { type: 'change'; update: (document: Scenario) => Scenario; label: string; at: number }
  | { type: 'undo' }
  | { type: 'redo' }
  | { type: 'saved'; document: Scenario }
  | { type: 'server'; update: (document: Scenario) => Scenario }
  | { type: 'reset'; document: Scenario };

function reduce(state: State, event: Event): State {
  switch (event.type) {
    case 'change': {
      const document = event.update(state.present.document);
      if (document === state.present.document) return state;
      const merge = state.present.label === event.label && event.at - state.present.at < MERGE_MS && state.past.length > 0;
      const past = merge ? state.past : [...state.past, state.present].slice(-LIMIT);
      return { ...state, past, present: { document, label: event.label, at: event.at }, future: [] };
    }
    case 'undo': {
      const previous = state.past[state.past.length - 1];
      if (!previous) return state;
      return { ...state, past: state.past.slice(0, -1), present: { ...previous, at: 0 }, future: [state.present, ...state.future] };
    }
    case 'redo': {
      const [next, ...rest] = state.future;
      if (!next) return state;
      return { ...state, past: [...state.past, state.present], present: { ...next, at: 0 }, future: rest };
    }
    case 'saved':
      return { ...state, saved: event.document };
    case 'server': {
      // A change the server already made (an upload): applied to every state, not undoable.
      const clean = state.present.document === state.saved;
      const present = { ...state.present, document: event.update(state.present.document) };
      const past = state.past.map((e) => ({ ...e, document: event.update(e.document) }));
      const future = state.future.map((e) => ({ ...e, document: event.update(e.document) }));
      return { past, present, future, saved: clean ? present.document : event.update(state.saved) };
    }
    case 'reset':
      return { past: [], present: { document: event.document, label: 'load', at: 0 }, future: [], saved: event.document };
  }
}

export type DocumentHistory = {
  document: Scenario;
  dirty: boolean;
  canUndo: boolean;
  canRedo: boolean;
  undoLabel: string | null;
  redoLabel: string | null;
  change: (label: string, update: (document: Scenario) => Scenario) => void;
  undo: () => void;
  redo: () => void;
  markSaved: (document: Scenario) => void;
  /** Apply a change the server has made already; keeps the saved state in step. */
  serverChange: (update: (document: Scenario) => Scenario) => void;
  reset: (document: Scenario) => void;
};

export function useDocumentHistory(initial: Scenario): DocumentHistory {
  const [state, dispatch] = useReducer(reduce, initial, (document) => reduce({} as State, { type: 'reset', document }));
  const change = useCallback((label: string, update: (document: Scenario) => Scenario) => dispatch({ type: 'change', update, label, at: Date.now() }), []);
  return useMemo(
    () => ({
      document: state.present.document,
      dirty: state.present.document !== state.saved,
      canUndo: state.past.length > 0,
      canRedo: state.future.length > 0,
      undoLabel: state.past.length > 0 ? state.present.label : null,
      redoLabel: state.future[0]?.label ?? null,
      change,
      undo: () => dispatch({ type: 'undo' }),
      redo: () => dispatch({ type: 'redo' }),
      markSaved: (document) => dispatch({ type: 'saved', document }),
      serverChange: (update) => dispatch({ type: 'server', update }),
      reset: (document) => dispatch({ type: 'reset', document }),
    }),
    [state, change],
  );
}
