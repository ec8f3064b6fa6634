/**
 * What a view sees of the pane, and the small pieces every view is built from.
 *
 * A view is a module under `views/` that exports one `make(ctx)` returning a `View`. Inside it:
 * - its own state in a `ViewState` (setters notify, so the view re-renders from state alone),
 * - pure render functions `(state, …, handlers) → elements` that read nothing else,
 * - handlers that change state, or run workbook work through `ctx.run` (which shows progress,
 *   the outcome, and any error in the status line, scoped to this view).
 * Views never import each other; what they share lives in `PaneState` (ctx.state) or in the
 * modules beside this one.
 */
import type { PaneHost } from './host';
import type { PaneState } from './state';
import type { TableLibrary } from './store';

export type StatusKind = 'info' | 'busy' | 'ok' | 'error';

/** An identifier of a registered view (see `views/index.ts`). */
export type ViewId = string;

export interface PaneContext {
  readonly host: PaneHost;
  readonly library: TableLibrary;
  readonly state: PaneState;
  /**
   * Announces a message in the status line, owned by the view on screen: it is cleared when
   * another view is shown or another action starts.
   */
  status(message: string, kind?: StatusKind): void;
  /**
   * Runs one asynchronous action: shows `busy`, awaits it, then shows the message it returns
   * (as `ok`) or the message of what it threw (as `error`). Resolves to true when it succeeded.
   * Throw a `PaneError` for a refusal the user must read ("Nothing read: …").
   */
  run(busy: string, action: () => Promise<string | void>): Promise<boolean>;
  /** Switches to a view by id. */
  show(view: ViewId): void;
  /** Selects a table (demo or library id) and loads its rows. */
  useTable(id: string): Promise<void>;
}

export interface View {
  readonly root: HTMLElement;
  /** Called when the view is shown and when the table in use changes while it is on screen. */
  refresh(): void;
}

/** A message for the user from an action that could not go on (shown as an error, as it is). */
export class PaneError extends Error {}

/** The text of anything an action threw: a LeewayError as "#CODE! message", else its message. */
export function messageOf(e: unknown): string {
  if (e && typeof e === 'object' && 'code' in e && 'message' in e && typeof (e as { code: unknown }).code === 'string') {
    const { code, message } = e as { code: string; message: string };
    return code.startsWith('#') ? `${code} ${message}` : message;
  }
  return e instanceof Error ? e.message : String(e);
}

/**
 * A view's own state: read with `get()`, change with `set()` (a shallow merge), and every change
 * notifies the listeners — the view subscribes its render once.
 */
export class ViewState<T extends object> {
  private value: T;
  private readonly listeners: Array<(s: Readonly<T>) => void> = [];

  constructor(initial: T) {
    this.value = initial;
  }

  get(): Readonly<T> {
    return this.value;
  }

  set(patch: Partial<T>): void {
    this.value = { ...this.value, ...patch };
    for (const l of this.listeners) l(this.value);
  }

  on(listener: (s: Readonly<T>) => void): void {
    this.listeners.push(listener);
  }
}
