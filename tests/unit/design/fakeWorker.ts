// A stand-in Worker for the tests of the design screen's worker wiring: records what it was sent
// and lets the test answer, or die, as the worker would.
export class FakeWorker<To, From> {
	sent: To[] = [];
	terminated = false;
	onmessage: ((e: MessageEvent<From>) => void) | null = null;
	onerror: ((e: ErrorEvent) => void) | null = null;
	postMessage(m: To) {
		this.sent.push(m);
	}
	terminate() {
		this.terminated = true;
	}
	answer(m: From) {
		this.onmessage?.({ data: m } as MessageEvent<From>);
	}
	die(message: string) {
		this.onerror?.({ message } as ErrorEvent);
	}
}

/** A factory of FakeWorkers for the wiring under test, with every worker it made. */
export function fakeWorkers<To, From>() {
	const made: FakeWorker<To, From>[] = [];
	const spawn = () => {
		const w = new FakeWorker<To, From>();
		made.push(w);
		return w as unknown as Worker;
	};
	return { made, spawn };
}
