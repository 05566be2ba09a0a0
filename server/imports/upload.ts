// Multer set-ups for the admin's uploads (memory storage with limits) and text decoding of CSVs.
import type { RequestHandler } from 'express'
import multer, { MulterError } from 'multer'
import { AppError, ValidationError } from '../http/errors'

/** One file in field `file`, kept in memory up to `maxBytes`; an oversized file becomes a 413 naming the limit. */
export function singleFileUpload(maxBytes: number, what: string): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 20, fieldSize: 100_000 }, defParamCharset: 'utf8' }).single('file')
  const limit = maxBytes >= 1024 * 1024 ? `${Math.round(maxBytes / (1024 * 1024))} MB` : `${Math.round(maxBytes / 1000)} kB`
  return (req, res, next) => {
    upload(req, res, (error: unknown) => {
      if (error instanceof MulterError && error.code === 'LIMIT_FILE_SIZE') {
        next(new AppError(413, 'file_too_large', `${what} may be at most ${limit}; this file is larger`, { file: `larger than ${limit}` }))
        return
      }
      if (error instanceof MulterError && error.code === 'LIMIT_UNEXPECTED_FILE') {
        next(new ValidationError({ [error.field ?? 'file']: 'send one file, in the field "file"' }))
        return
      }
      next(error)
    })
  }
}

const decoder = new TextDecoder('utf-8', { fatal: true })

/** The uploaded bytes as text; refuses binary files and text that is not UTF-8. */
export function csvText(file: Express.Multer.File | undefined, field = 'file'): string {
  if (!file) throw new ValidationError({ [field]: 'choose a CSV file to upload' })
  if (file.buffer.length === 0) throw new ValidationError({ [field]: 'the file is empty' })
  if (file.buffer.includes(0)) throw new ValidationError({ [field]: 'this is not a text file; save the sheet as CSV (UTF-8)' })
  try {
    return decoder.decode(file.buffer)
  } catch {
    throw new ValidationError({ [field]: 'the file is not UTF-8 text; save the sheet as "CSV UTF-8"' })
  }
}
