// $fetch has no upload progress; XMLHttpRequest does. Resolves with the parsed JSON, rejects with
// an error shaped like $fetch's (`data.message`) so useFormErrors reads both alike.
export interface UploadProgress {
  phase: 'uploading' | 'analysing' | 'done' | 'failed'
  /** 0–1 while uploading. */
  fraction: number
}

export function uploadWithProgress<T>(url: string, form: FormData, onProgress: (progress: UploadProgress) => void): Promise<T> {
  return new Promise((resolve, reject) => {
    const request = new XMLHttpRequest()
    request.open('POST', url)
    request.responseType = 'json'
    request.setRequestHeader('accept', 'application/json')
    request.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress({ phase: 'uploading', fraction: event.loaded / event.total })
    }
    request.upload.onload = () => onProgress({ phase: 'analysing', fraction: 1 })
    request.onload = () => {
      if (request.status >= 200 && request.status < 300) {
        onProgress({ phase: 'done', fraction: 1 })
        resolve(request.response as T)
      } else {
        onProgress({ phase: 'failed', fraction: 1 })
        reject(Object.assign(new Error(request.response?.message ?? `Upload failed (${request.status})`), { data: request.response, statusCode: request.status }))
      }
    }
    request.onerror = () => {
      onProgress({ phase: 'failed', fraction: 1 })
      reject(Object.assign(new Error('The upload was interrupted. Check your connection and try again.'), { data: { message: 'The upload was interrupted. Check your connection and try again.' } }))
    }
    request.send(form)
  })
}
