import type { RequestHandler } from 'express'
import type { z } from 'zod'
import { IdParam } from '../../shared/schemas/common'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import type { Actor } from '../services/admin'

// The handlers most routes are made of: parse the body (and the `:id`), call one service with
// the signed-in actor, answer its result. A route whose handler does more writes it out.

/** The `:id` parameter of a route, checked to be a record id (a 400 naming `id` otherwise). */
export function idOf(params: { id?: string }): string {
  return parse(IdParam, params.id)
}

/** Creates a record from the parsed body and answers it with 201. */
export function createHandler<S extends z.ZodType>(
  schema: S,
  create: (input: z.infer<S>, actor: Actor) => Promise<unknown>,
): RequestHandler {
  return async (req, res) => {
    res.status(201).json(await create(parse(schema, req.body), actorOf(req)))
  }
}

/** Changes the `:id` record with the parsed body and answers the service's result. */
export function changeHandler<S extends z.ZodType>(
  schema: S,
  change: (id: string, input: z.infer<S>, actor: Actor) => Promise<unknown>,
): RequestHandler {
  return async (req, res) => {
    res.json(await change(idOf(req.params), parse(schema, req.body), actorOf(req)))
  }
}

/** Deletes the `:id` record and answers 204. */
export function deleteHandler(
  remove: (id: string, actor: Actor) => Promise<unknown>,
): RequestHandler {
  return async (req, res) => {
    await remove(idOf(req.params), actorOf(req))
    res.status(204).end()
  }
}

/** Answers `answer(parsed query string)`: a filtered list, a summary. */
export function queryHandler<S extends z.ZodType>(
  schema: S,
  answer: (query: z.infer<S>) => Promise<unknown>,
): RequestHandler {
  return async (req, res) => {
    res.json(await answer(parse(schema, req.query)))
  }
}

/** Answers `read(:id)`: one record. */
export function readHandler(read: (id: string) => Promise<unknown>): RequestHandler {
  return async (req, res) => {
    res.json(await read(idOf(req.params)))
  }
}
