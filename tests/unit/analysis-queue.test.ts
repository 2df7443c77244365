// The analysis queue's policy (server/utils/analysis-pool.ts) with a fake task runner: tasks end when a
// test says so, and the running limit is driven by fake timers, so nothing here depends on real timing.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { FairQueue, type FairQueueOptions, type TaskControl } from '../../server/utils/analysis-pool'
import { DomainError, TooManyRequests } from '../../server/utils/errors'

interface FakeTask {
  name: string
  control: TaskControl
  finish: () => void
  fail: (error: unknown) => void
}

/** A queue whose runner records each task it is given and lets the test end it. */
function fakeQueue(options: Partial<FairQueueOptions> = {}) {
  const started: FakeTask[] = []
  const queue = new FairQueue<string, string>(
    (name, control) =>
      new Promise<string>((resolve, reject) => {
        // Like the worker pool, the runner lets go of its thread as soon as it is aborted.
        control.signal.addEventListener('abort', () => reject(new Error('aborted')))
        started.push({ name, control, finish: () => resolve(`${name} done`), fail: reject })
      }),
    { threads: 1, heavyThreads: 1, runningLimitMs: 60_000, maxWaitingPerOwner: 10, ...options },
  )
  const results = new Map<string, Promise<string>>()
  const submit = (ownerKey: string, name: string, extra: { heavy?: boolean; signal?: AbortSignal } = {}) => {
    const result = queue.submit({ ownerKey, label: `${name}.svg`, input: name, heavy: extra.heavy ?? false, signal: extra.signal })
    // Tests look at rejections when they care; an unobserved one must not fail the run.
    result.catch(() => {})
    results.set(name, result)
    return result
  }
  const task = (name: string) => {
    const found = started.find((t) => t.name === name)
    if (!found) throw new Error(`${name} has not started; started: ${started.map((t) => t.name).join(', ')}`)
    return found
  }
  /** Ends a running task and lets the queue hand out the free thread. */
  const finish = async (name: string) => {
    task(name).finish()
    await results.get(name)
    await vi.advanceTimersByTimeAsync(0)
  }
  const startedNames = () => started.map((t) => t.name)
  return { queue, submit, task, finish, startedNames }
}

beforeEach(() => {
  vi.useFakeTimers()
})
afterEach(() => {
  vi.useRealTimers()
})

describe('turns between members', () => {
  it('serves members in turn, so ten files of one member do not hold back another member\'s one', async () => {
    const { submit, finish, startedNames } = fakeQueue()
    for (let i = 1; i <= 10; i++) submit('user:1', `a${i}`)
    submit('user:2', 'b1')
    submit('user:3', 'c1')
    expect(startedNames()).toEqual(['a1'])
    await finish('a1')
    await finish('b1')
    await finish('c1')
    await finish('a2')
    expect(startedNames()).toEqual(['a1', 'b1', 'c1', 'a2', 'a3'])
  })

  it('keeps each member\'s own files in the order they were sent', async () => {
    const { submit, finish, startedNames } = fakeQueue()
    submit('user:1', 'a1')
    submit('user:1', 'a2')
    submit('user:2', 'b1')
    submit('user:2', 'b2')
    for (const name of ['a1', 'b1', 'a2', 'b2']) await finish(name)
    expect(startedNames()).toEqual(['a1', 'b1', 'a2', 'b2'])
  })

  it('sends a member whose file just finished behind the members who were waiting meanwhile', async () => {
    const { submit, finish, startedNames } = fakeQueue()
    submit('user:1', 'a1')
    submit('user:2', 'b1')
    submit('user:1', 'a2')
    await finish('a1')
    expect(startedNames()).toEqual(['a1', 'b1'])
  })
})

describe('one running analysis per member while others wait', () => {
  it('gives a free thread to a member with nothing running before a member who has a file running', async () => {
    const { submit, finish, startedNames } = fakeQueue({ threads: 2, heavyThreads: 1 })
    submit('user:1', 'a1')
    submit('user:2', 'b1')
    submit('user:1', 'a2')
    submit('user:3', 'c1')
    expect(startedNames()).toEqual(['a1', 'b1'])
    await finish('b1')
    // a2 was sent first, but its member already has a1 running.
    expect(startedNames()).toEqual(['a1', 'b1', 'c1'])
  })

  it('lets a member use a second thread when nobody else is waiting for it', async () => {
    const { submit, startedNames } = fakeQueue({ threads: 2, heavyThreads: 1 })
    submit('user:1', 'a1')
    submit('user:1', 'a2')
    expect(startedNames()).toEqual(['a1', 'a2'])
  })

  it('keeps a thread free of heavy files, so a small file starts at once while a heavy one runs', async () => {
    const { submit, startedNames } = fakeQueue({ threads: 2, heavyThreads: 1 })
    submit('user:1', 'heavyA', { heavy: true })
    submit('user:2', 'heavyB', { heavy: true })
    submit('user:3', 'small', { heavy: false })
    expect(startedNames()).toEqual(['heavyA', 'small'])
  })

  it('refuses more waiting files than the limit per member, and only for that member', async () => {
    const { submit } = fakeQueue({ maxWaitingPerOwner: 2 })
    submit('user:1', 'a1')
    submit('user:1', 'a2')
    submit('user:1', 'a3')
    await expect(submit('user:1', 'a4')).rejects.toBeInstanceOf(TooManyRequests)
    submit('user:2', 'b1')
  })
})

describe('running time limit', () => {
  it('counts only the time a file runs, not the time it waits', async () => {
    const { submit, finish, task } = fakeQueue({ runningLimitMs: 60_000 })
    submit('user:1', 'heavy')
    const small = submit('user:2', 'small')
    await vi.advanceTimersByTimeAsync(50_000)
    await finish('heavy')
    // 50 s waited, 50 s running: 100 s since it was sent, yet under the limit.
    await vi.advanceTimersByTimeAsync(50_000)
    task('small').finish()
    await expect(small).resolves.toBe('small done')
  })

  it('refuses a file that runs too long with the timeout kind, ends its task and starts the next', async () => {
    const { submit, task, startedNames } = fakeQueue({ runningLimitMs: 60_000 })
    const slow = submit('user:1', 'slow')
    submit('user:2', 'next')
    await vi.advanceTimersByTimeAsync(59_999)
    expect(task('slow').control.signal.aborted).toBe(false)
    await vi.advanceTimersByTimeAsync(1)
    const error = await slow.catch((e: unknown) => e)
    expect(error).toBeInstanceOf(DomainError)
    expect((error as DomainError).status).toBe(422)
    expect((error as DomainError).details).toEqual({ kind: 'timeout' })
    expect(task('slow').control.signal.aborted).toBe(true)
    expect(startedNames()).toEqual(['slow', 'next'])
  })

  it('passes a runner\'s own error to the caller unchanged', async () => {
    const { submit, task } = fakeQueue()
    const result = submit('user:1', 'bad')
    const refusal = new DomainError('The drawing has no visible lines.', 422, { kind: 'empty' })
    task('bad').fail(refusal)
    await expect(result).rejects.toBe(refusal)
  })
})

describe('queue status', () => {
  it('shows a member only their own files, with how many start before each and the running stage', async () => {
    const { queue, submit, task } = fakeQueue()
    submit('user:1', 'a1')
    submit('user:1', 'a2')
    submit('user:1', 'a3')
    submit('user:2', 'b1')
    submit('user:3', 'c1')
    submit('user:3', 'c2')
    task('a1').control.onStage('checks')
    await vi.advanceTimersByTimeAsync(1_500)
    expect(queue.statusFor('user:1')).toEqual({
      // user:1 has a1 running, so b1 and c1 go first; then a2, then c2 (round 2), then a3.
      waiting: [
        { label: 'a2.svg', ahead: 2 },
        { label: 'a3.svg', ahead: 4 },
      ],
      running: [{ label: 'a1.svg', stage: 'checks', runningMs: 1_500 }],
    })
    expect(queue.statusFor('user:2')).toEqual({ waiting: [{ label: 'b1.svg', ahead: 0 }], running: [] })
    expect(queue.statusFor('user:3')).toEqual({
      waiting: [
        { label: 'c1.svg', ahead: 1 },
        { label: 'c2.svg', ahead: 3 },
      ],
      running: [],
    })
    expect(queue.statusFor('user:4')).toEqual({ waiting: [], running: [] })
  })

  it('agrees with the order in which the files then start', async () => {
    const { queue, submit, finish, startedNames } = fakeQueue()
    for (const [owner, name] of [['user:1', 'a1'], ['user:1', 'a2'], ['user:2', 'b1'], ['user:1', 'a3'], ['user:3', 'c1'], ['user:2', 'b2']]) submit(owner!, name!)
    const predicted = ['user:1', 'user:2', 'user:3']
      .flatMap((owner) => queue.statusFor(owner).waiting)
      .sort((x, y) => x.ahead - y.ahead)
      .map((w) => w.label.replace('.svg', ''))
    for (const name of ['a1', ...predicted]) await finish(name)
    expect(startedNames().slice(1)).toEqual(predicted)
  })

  it('drops a file whose sender gave up while it waited', async () => {
    const { queue, submit, startedNames } = fakeQueue()
    submit('user:1', 'a1')
    const gaveUp = new AbortController()
    const dropped = submit('user:2', 'b1', { signal: gaveUp.signal })
    submit('user:3', 'c1')
    gaveUp.abort(new Error('closed the page'))
    await expect(dropped).rejects.toThrow('closed the page')
    expect(queue.statusFor('user:2')).toEqual({ waiting: [], running: [] })
    expect(queue.statusFor('user:3').waiting).toEqual([{ label: 'c1.svg', ahead: 0 }])
    expect(startedNames()).toEqual(['a1'])
  })
})
