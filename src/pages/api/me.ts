import { endpoint, json, requireActor } from '../../lib/http';

export const GET = endpoint(({ locals }) => json({ user: requireActor(locals) }));
