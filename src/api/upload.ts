import { apiErrorBodySchema } from '@shared/schemas/errors'
import { ApiError, safeJson, withQuery, type RequestOptions } from './http'

export interface UploadOptions {
  query?: RequestOptions['query']
  /** Called as the bytes go out, with the fraction sent (0 to 1). */
  onProgress?: (fraction: number) => void
  signal?: AbortSignal
}

/**
 * Sends a file as the request body with XMLHttpRequest, whose upload events report progress
 * (fetch has none). Resolves with the parsed JSON body; rejects with an ApiError like `request`.
 */
export function uploadFile<T>(path: string, file: Blob, options: UploadOptions = {}): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest()
    xhr.open('POST', withQuery(`/api${path}`, options.query))
    xhr.withCredentials = true
    xhr.setRequestHeader('Accept', 'application/json')
    xhr.setRequestHeader('Content-Type', file.type || 'application/octet-stream')
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable && event.total > 0)
        options.onProgress?.(event.loaded / event.total)
    }
    xhr.onload = () => {
      const data: unknown = xhr.responseText ? safeJson(xhr.responseText) : undefined
      if (xhr.status >= 200 && xhr.status < 300) return resolve(data as T)
      const parsed = apiErrorBodySchema.safeParse(data)
      if (parsed.success) {
        const { code, message, issues } = parsed.data.error
        return reject(new ApiError(xhr.status, code, message, issues ?? [], data))
      }
      reject(new ApiError(xhr.status, 'http_error', `The server answered ${xhr.status}.`))
    }
    xhr.onerror = () =>
      reject(
        new ApiError(0, 'network', 'The upload was interrupted. Check the connection and retry.'),
      )
    xhr.onabort = () => reject(new DOMException('The upload was cancelled.', 'AbortError'))
    options.signal?.addEventListener('abort', () => xhr.abort())
    xhr.send(file)
  })
}
