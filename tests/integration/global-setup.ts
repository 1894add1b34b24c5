/** Waits for the app that scripts/test.sh started (APP_URL) to answer its health check. */
export default async function setup() {
	const base = process.env.APP_URL ?? 'http://127.0.0.1:4173';
	const deadline = Date.now() + 30_000;
	while (Date.now() < deadline) {
		try {
			const res = await fetch(`${base}/api/health`);
			if (res.ok) return;
		} catch {
			// not up yet
		}
		await new Promise((r) => setTimeout(r, 250));
	}
	throw new Error(`The app at ${base} did not answer /api/health; start it with scripts/test.sh`);
}
