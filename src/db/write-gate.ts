import type { Client, InStatement, Transaction, TransactionMode } from '@libsql/client';
import { isReadSql } from './read-sql';

/**
 * Serialises this process's writes to a local SQLite file.
 *
 * libSQL's local driver is synchronous and gives each transaction its own connection. A write that
 * arrives while another connection holds the write lock waits on SQLite's busy timeout *inside* a
 * synchronous call, freezing the event loop, so the transaction holding the lock can never commit:
 * both stall for the whole timeout and one fails. Queueing every write (plain statements, batches and
 * write transactions, including the auth layer's) behind one in-process gate avoids that. Reads
 * (`isReadSql`: SELECT, or WITH … SELECT) pass straight through; writers in other processes still wait
 * on the busy timeout as usual.
 */
export function gateWrites(client: Client): Client {
  let tail: Promise<void> = Promise.resolve();
  function acquire(): Promise<() => void> {
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    const previous = tail;
    tail = previous.then(() => held);
    return previous.then(() => release);
  }
  async function gated<T>(run: () => Promise<T>): Promise<T> {
    const release = await acquire();
    try {
      return await run();
    } finally {
      release();
    }
  }
  const isRead = (stmt: InStatement | string) => isReadSql(typeof stmt === 'string' ? stmt : stmt.sql);

  const gatedClient = new Proxy(client, {
    get(target, prop, receiver) {
      switch (prop) {
        case 'execute':
          return (stmt: InStatement | string, args?: never) =>
            isRead(stmt) ? target.execute(stmt as never, args) : gated(() => target.execute(stmt as never, args));
        case 'batch':
        case 'migrate':
        case 'executeMultiple':
          return (...args: unknown[]) => gated(() => (target[prop] as (...a: unknown[]) => Promise<unknown>)(...args));
        case 'transaction':
          return async (mode?: TransactionMode) => {
            if (mode === 'read') return target.transaction(mode);
            const release = await acquire();
            try {
              return releaseOnEnd(await target.transaction(mode), release);
            } catch (err) {
              release();
              throw err;
            }
          };
        default: {
          const value = Reflect.get(target, prop, receiver);
          return typeof value === 'function' ? value.bind(target) : value;
        }
      }
    },
  });
  gates.set(gatedClient, gated);
  return gatedClient;
}

const gates = new WeakMap<Client, <T>(run: () => Promise<T>) => Promise<T>>();

/**
 * Runs a write made some other way than through the client (e.g. on a worker thread's connection) in its turn
 * at the client's write gate, so it never meets one of this process's other writes at SQLite's lock. A client
 * without a gate (a libSQL server) runs it at once.
 */
export function inWriteTurn<T>(client: Client, run: () => Promise<T>): Promise<T> {
  const gated = gates.get(client);
  return gated ? gated(run) : run();
}

function releaseOnEnd(tx: Transaction, release: () => void): Transaction {
  let released = false;
  const done = () => {
    if (!released) {
      released = true;
      release();
    }
  };
  return new Proxy(tx, {
    get(target, prop, receiver) {
      if (prop === 'commit' || prop === 'rollback') {
        return async () => {
          try {
            return await (target[prop] as () => Promise<void>)();
          } finally {
            done();
          }
        };
      }
      if (prop === 'close') {
        return () => {
          target.close();
          done();
        };
      }
      const value = Reflect.get(target, prop, receiver);
      return typeof value === 'function' ? value.bind(target) : value;
    },
  });
}
