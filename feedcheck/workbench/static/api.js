// The server's JSON API (WORKBENCH_API.md). Relative URLs only: the token travels in them.

export class ApiError extends Error {
  constructor(status, body) {
    super((body && body.error) || `the server answered ${status}`);
    this.status = status;
    this.body = body || {};
  }
}

async function answer(response) {
  let body = null;
  try {
    body = await response.json();
  } catch {
    body = { error: `the server answered ${response.status} ${response.statusText}` };
  }
  if (!response.ok) throw new ApiError(response.status, body);
  return body;
}

export async function getJSON(path) {
  const response = await fetch(path, { headers: { Accept: "application/json" } });
  return answer(response);
}

export async function postJSON(path, body, extra = {}) {
  const response = await fetch(path, {
    method: "POST",
    headers: { "Content-Type": "application/json", Accept: "application/json" },
    body: JSON.stringify(body || {}),
    ...extra,
  });
  return answer(response);
}

/**
 * The edits of one page, sent in order, one request at a time.
 *
 * Field edits ("set") typed in quick succession are merged (the last text of a field wins)
 * and sent after a quiet period; structural edits (add, remove, text) are sent at once.
 * Each answer is the whole state, handed to onState. A stale revision (409) is answered by
 * fetching the state and sending the same edits again on the new revision.
 */
export class EditQueue {
  constructor({ onState, onBusy, onError, delayMs = 350 }) {
    this.onState = onState;
    this.onBusy = onBusy;
    this.onError = onError;
    this.delayMs = delayMs;
    this.rev = 0;
    this.sets = new Map();
    this.ops = [];
    this.inflight = null;
    this.timer = null;
    this.idleWaiters = [];
  }

  /** The field values still waiting to be sent: "kind|index|key" → text. */
  pendingKeys() {
    return new Set(this.sets.keys());
  }

  set(kind, index, key, value) {
    this.sets.set(`${kind}|${index}|${key}`, { op: "set", kind, index, key, value });
    this.onBusy(true);
    clearTimeout(this.timer);
    this.timer = setTimeout(() => this.flush(), this.delayMs);
  }

  op(edit) {
    this.ops.push(edit);
    return this.flush();
  }

  /** Send whatever is waiting now; resolves when everything sent has been answered. */
  flush() {
    clearTimeout(this.timer);
    this.timer = null;
    if (!this.inflight && (this.sets.size || this.ops.length)) {
      const edits = [...this.sets.values(), ...this.ops];
      this.sets.clear();
      this.ops = [];
      this.inflight = this.send(edits).finally(() => {
        this.inflight = null;
        if (this.sets.size || this.ops.length) this.flush();
        else this.settle();
      });
    }
    return this.idle();
  }

  /** Resolves once nothing is waiting and nothing is on its way. */
  idle() {
    if (!this.inflight && !this.sets.size && !this.ops.length) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  settle() {
    this.onBusy(false);
    const waiters = this.idleWaiters;
    this.idleWaiters = [];
    for (const resolve of waiters) resolve();
  }

  async send(edits, retried = false) {
    this.onBusy(true);
    try {
      this.accept(await postJSON("api/edit", { rev: this.rev, edits }));
    } catch (err) {
      if (!(err instanceof ApiError && err.status === 409 && !retried)) return this.onError(err);
      try {
        this.accept(await getJSON("api/state"));
      } catch (again) {
        return this.onError(again);
      }
      return this.send(edits, true);
    }
  }

  accept(state) {
    if (typeof state.rev === "number") this.rev = state.rev;
    this.onState(state);
  }
}
