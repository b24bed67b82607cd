/**
 * An API call whose answer the store keeps: `keep` runs on the answer (puts it in a list,
 * refetches the list) before the call's promise settles, and the answer is returned.
 * @param call the API call, e.g. `customersApi.update`; its arguments pass through
 * @param keep what the store does with the answer; awaited when it returns a promise
 */
export function saving<A extends unknown[], T>(
  call: (...args: A) => Promise<T>,
  keep: (answer: T) => unknown,
): (...args: A) => Promise<T> {
  return async (...args) => {
    const answer = await call(...args)
    await keep(answer)
    return answer
  }
}
