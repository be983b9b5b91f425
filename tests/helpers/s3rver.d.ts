// The few parts of s3rver (an S3-compatible test server) the storage tests use; it ships no types.
declare module 's3rver' {
	type Options = {
		address?: string;
		port?: number;
		silent?: boolean;
		directory: string;
		configureBuckets?: { name: string; configs: unknown[] }[];
	};
	export default class S3rver {
		constructor(options: Options);
		run(): Promise<{ address: string; port: number }>;
		close(): Promise<void>;
	}
}
