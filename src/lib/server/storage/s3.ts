import {
	DeleteObjectCommand,
	GetObjectCommand,
	HeadObjectCommand,
	PutObjectCommand,
	S3Client,
	S3ServiceException
} from '@aws-sdk/client-s3';
import type { S3Settings } from '../env';
import { assertKey } from './keys';
import type { Storage, StoredFile } from './types';

/** Files in an S3-compatible bucket. A PutObject is atomic on the service's side. */
export class S3Storage implements Storage {
	readonly kind = 's3' as const;
	readonly client: S3Client;

	constructor(private readonly settings: S3Settings) {
		this.client = new S3Client({
			region: settings.region,
			endpoint: settings.endpoint,
			forcePathStyle: settings.forcePathStyle,
			credentials:
				settings.accessKeyId && settings.secretAccessKey
					? { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey }
					: undefined,
			// Many S3-compatible services do not accept the SDK's newer default checksums on every
			// request; send them only where the API requires one.
			requestChecksumCalculation: 'WHEN_REQUIRED',
			responseChecksumValidation: 'WHEN_REQUIRED'
		});
	}

	private objectKey(key: string): string {
		assertKey(key);
		return this.settings.prefix + key;
	}

	async put(key: string, bytes: Uint8Array, contentType: string): Promise<void> {
		await this.client.send(
			new PutObjectCommand({
				Bucket: this.settings.bucket,
				Key: this.objectKey(key),
				Body: bytes,
				ContentType: contentType,
				ContentLength: bytes.byteLength
			})
		);
	}

	async get(key: string): Promise<StoredFile | null> {
		try {
			const out = await this.client.send(
				new GetObjectCommand({ Bucket: this.settings.bucket, Key: this.objectKey(key) })
			);
			const bytes = Buffer.from(await out.Body!.transformToByteArray());
			return {
				bytes,
				contentType: out.ContentType || 'application/octet-stream',
				size: bytes.length
			};
		} catch (e) {
			if (isNotFound(e)) return null;
			throw e;
		}
	}

	async delete(key: string): Promise<void> {
		await this.client.send(
			new DeleteObjectCommand({ Bucket: this.settings.bucket, Key: this.objectKey(key) })
		);
	}

	async exists(key: string): Promise<boolean> {
		try {
			await this.client.send(
				new HeadObjectCommand({ Bucket: this.settings.bucket, Key: this.objectKey(key) })
			);
			return true;
		} catch (e) {
			if (isNotFound(e)) return false;
			throw e;
		}
	}
}

function isNotFound(e: unknown): boolean {
	return (
		e instanceof S3ServiceException &&
		(e.name === 'NoSuchKey' || e.name === 'NotFound' || e.$metadata.httpStatusCode === 404)
	);
}
