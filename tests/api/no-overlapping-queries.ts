// Set up before every API test file: fails the file when the server under test sent a query on a
// connection that was still running one. A transaction is one connection, so `Promise.all` over a
// transaction's queries queues them behind each other; pg warns ("Calling client.query() when the
// client is already executing a query is deprecated") and pg 9 will refuse it. Today's warning is
// tomorrow's error, so it fails here, with the stack of the query that overlapped. Only our own code
// counts: TypeORM's schema comparison (the migrations test) overlaps its catalogue queries itself.
import { afterAll, expect } from 'vitest';

const overlapping: string[] = [];
process.on('warning', (warning) => {
  const stack = warning.stack ?? warning.message;
  if (/already executing a query/.test(warning.message) && stack.includes('/backend/src/')) overlapping.push(stack);
});

afterAll(async () => {
  // Warnings are emitted on the next tick.
  await new Promise((resolve) => setImmediate(resolve));
  expect(overlapping, 'a query was sent on a connection still running another (see the stack)').toEqual([]);
});
