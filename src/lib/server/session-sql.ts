/** The session read, as text: no database is opened here, so the vault benchmark's baseline can import it. */

/**
 * The session of a token with its user and their teams (as JSON), in one indexed read. Plain text, so a request
 * spends nothing on building it; the vault benchmark's baseline runs this same statement.
 */
export const SESSION_SQL = `
    SELECT s.id AS sessionId, s.expires_at AS expiresAt, u.id AS id, u.name AS name, u.email AS email,
      (SELECT json_group_array(json_object('id', t.id, 'name', t.name, 'role', m.role) ORDER BY m.created_at, t.id)
       FROM membership m JOIN team t ON t.id = m.team_id WHERE m.user_id = u.id) AS teams
    FROM session s JOIN user u ON u.id = s.user_id
    WHERE s.token = ?`;

export interface SessionRow { sessionId: string; expiresAt: number; id: string; name: string; email: string; teams: string }
