import type { Request } from 'express';
import { matchMarksSchema, matchSaveSchema, matchUploadSchema, patternQuerySchema } from '@shared/api/match.schema';
import { ApiRouter, type StudioCaller } from '../../core/api-router';
import { idParam, studioRole } from '../../core/policy';
import type { MatchesService } from './matches.service';

/** /api/studios/:studioId/matches: fit a panel type to a photo of the match pattern on a real panel. Viewers look, editors upload and fit, owners delete anyone's. */
export function matchesRoutes(matches: MatchesService): ApiRouter {
  const api = new ApiRouter('/studios/:studioId/matches', 'Panel match');
  const matchId = (req: Pick<Request, 'params'>) => idParam(req, 'matchId', 'The match');
  const actor = (req: StudioCaller) => req.membership;

  api.route(
    'get',
    '/pattern',
    {
      policy: studioRole('viewer'),
      summary:
        "A look's match pattern (a built-in preset id, or studio:<preset id>) to show on the real panel 1:1: png (one pixel a cell, the default), or frame data as bin, hex (Intel HEX) or c (a C header)",
      query: patternQuerySchema,
    },
    async (req, res) => {
      const { look, format } = req.query;
      const { bytes, fileName, contentType } = await matches.pattern(req.membership.studioId, look, format);
      res
        .set({
          'Content-Type': contentType,
          'X-Content-Type-Options': 'nosniff',
          'Content-Disposition': `attachment; filename="${fileName}"`,
          'Cache-Control': 'private, max-age=300',
        })
        .send(bytes);
    },
  );
  api.route('get', '/', { policy: studioRole('viewer'), summary: "The studio's panel matches, newest first" }, async (req, res) => {
    res.json({ matches: await matches.list(req.membership.studioId) });
  });
  api.route(
    'post',
    '/',
    {
      policy: studioRole('editor'),
      summary:
        'Upload a photo of the match pattern (multipart field "file"; look, and optional activeWidthMm, activeHeightMm, cameraGamma)',
      upload: { fields: matchUploadSchema, file: 'the photo' },
      status: 201,
    },
    async (req, res) => {
      res.status(201).json({ match: await matches.create(actor(req), req.file.buffer, req.file.originalname, req.body) });
    },
  );
  api.route(
    'get',
    '/:matchId',
    { policy: studioRole('viewer'), summary: 'One match: its marks, the fit’s progress and result' },
    async (req, res) => {
      res.json({ match: await matches.get(req.membership.studioId, matchId(req)) });
    },
  );
  api.route(
    'get',
    '/:matchId/photo',
    { policy: studioRole('viewer'), summary: 'The photo, upright, as a JPEG for placing the marks' },
    async (req, res) => {
      res
        .set({ 'Content-Type': 'image/jpeg', 'Cache-Control': 'private, max-age=3600' })
        .send(await matches.photo(req.membership.studioId, matchId(req)));
    },
  );
  api.route(
    'get',
    '/:matchId/rectified',
    {
      policy: studioRole('viewer'),
      summary:
        'The photo resampled onto the panel’s grid through the marks (PNG, the size of the simulated pattern); 409 until the marks are placed',
    },
    async (req, res) => {
      res
        .set({ 'Content-Type': 'image/png', 'Cache-Control': 'private, no-store' })
        .send(await matches.rectified(req.membership.studioId, matchId(req)));
    },
  );
  api.route(
    'get',
    '/:matchId/simulated',
    { policy: studioRole('viewer'), summary: 'The match pattern as the starting look shows it (a reference render, PNG)' },
    async (req, res) => {
      res
        .set({ 'Content-Type': 'image/png', 'Cache-Control': 'private, max-age=3600' })
        .send(await matches.simulated(req.membership.studioId, matchId(req)));
    },
  );
  api.route(
    'get',
    '/:matchId/residual',
    {
      policy: studioRole('viewer'),
      summary: "A finished fit's photo, model and their difference in the isolated-cell box, side by side (PNG)",
    },
    async (req, res) => {
      res
        .set({ 'Content-Type': 'image/png', 'Cache-Control': 'private, no-store' })
        .send(await matches.residual(req.membership.studioId, matchId(req)));
    },
  );
  api.route(
    'put',
    '/:matchId/marks',
    {
      policy: studioRole('editor'),
      summary:
        'Place the four marks (photo pixels: top-left, top-right, bottom-right, bottom-left); 422 saying why when they cannot be the panel’s corners',
      body: matchMarksSchema,
    },
    async (req, res) => {
      res.json({ match: await matches.setMarks(actor(req), matchId(req), req.body.marks) });
    },
  );
  api.route(
    'post',
    '/:matchId/fit',
    {
      policy: studioRole('editor'),
      summary: 'Fit the panel (a background job on the render pool; poll the match for progress)',
      status: 202,
    },
    async (req, res) => {
      res.status(202).json({ match: await matches.fit(actor(req), matchId(req)) });
    },
  );
  api.route(
    'post',
    '/:matchId/save',
    {
      policy: studioRole('editor'),
      summary:
        'Save a finished fit as a new studio preset ({ name }), or as a new revision of the studio preset it started from ({ revisionOfLook: true }); levelCurve: true takes the measured level curve as the duty table',
      body: matchSaveSchema,
      status: 201,
    },
    async (req, res) => {
      res.status(201).json(await matches.save(actor(req), matchId(req), req.body));
    },
  );
  api.route(
    'delete',
    '/:matchId',
    { policy: studioRole('editor'), summary: 'Delete a match and its photo (your own, or anyone’s as an owner)', status: 204 },
    async (req, res) => {
      await matches.remove(actor(req), matchId(req));
      res.status(204).end();
    },
  );
  return api;
}
