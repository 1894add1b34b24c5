/**
 * The part of autocannon 9's programmatic API that the load test and the benchmark use (the package
 * ships no types). Field meanings from its README: latency in ms, requests in requests per second.
 */
declare module 'autocannon' {
	namespace autocannon {
		interface Options {
			url: string;
			connections?: number;
			/** seconds */
			duration?: number;
			/** seconds to wait for a response before counting a timeout */
			timeout?: number;
			method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE' | 'HEAD';
			headers?: Record<string, string>;
			body?: string | Buffer;
			pipelining?: number;
			title?: string;
			/** a falsy answer counts the response in `mismatches` */
			verifyBody?: (body: string) => boolean;
		}
		/** hdr-histogram-percentiles-obj */
		interface Histogram {
			min: number;
			max: number;
			average: number;
			mean: number;
			stddev: number;
			total: number;
			sent?: number;
			p2_5: number;
			p50: number;
			p75: number;
			p90: number;
			p97_5: number;
			p99: number;
			p99_9: number;
		}
		interface Result {
			title?: string;
			url: string;
			requests: Histogram;
			latency: Histogram;
			throughput: Histogram;
			/** seconds */
			duration: number;
			/** connection errors, timeouts included */
			errors: number;
			timeouts: number;
			mismatches: number;
			non2xx: number;
			resets: number;
			connections: number;
			'1xx': number;
			'2xx': number;
			'3xx': number;
			'4xx': number;
			'5xx': number;
			statusCodeStats: Record<string, { count: number }>;
			start: Date;
			finish: Date;
		}
		interface Instance extends Promise<Result> {
			stop(): void;
		}
	}
	function autocannon(opts: autocannon.Options): autocannon.Instance;
	export = autocannon;
}
