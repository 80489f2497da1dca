import { AfterAnswer } from '../../server/lib/http/after-answer';

// Work a route starts after it has answered: kept until it ends, its failures logged and never thrown.
describe('AfterAnswer', () => {
  it('When the work rejects, then the failure is logged with its label and settled() resolves', async () => {
    const logged: string[] = [];
    const after = new AfterAnswer((m) => logged.push(m));
    after.run('reset mail', async () => {
      throw new Error('smtp refused');
    });
    await after.settled();
    expect(logged).toEqual(['[error] reset mail: smtp refused']);
  });

  it('When the work throws before it returns a promise, then the caller goes on and the failure is logged the same way', async () => {
    const logged: string[] = [];
    const after = new AfterAnswer((m) => logged.push(m));
    const throwsAtOnce = (() => {
      throw new Error('bad setup');
    }) as unknown as () => Promise<void>;
    expect(() => after.run('reset lookup', throwsAtOnce)).not.toThrow();
    await after.settled();
    expect(logged).toEqual(['[error] reset lookup: bad setup']);
  });

  it('When work is still going, then settled() waits for it, and for work it starts meanwhile', async () => {
    const after = new AfterAnswer(() => undefined);
    const done: string[] = [];
    after.run('first', async () => {
      await new Promise((r) => setTimeout(r, 20));
      done.push('first');
      after.run('second', async () => {
        await new Promise((r) => setTimeout(r, 20));
        done.push('second');
      });
    });
    await after.settled();
    expect(done).toEqual(['first', 'second']);
  });
});
