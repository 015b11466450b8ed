import { EntitySchema } from 'typeorm';

/** A physician's clinical note on a flag, kept as written. Case-level: physicians only. */
export interface FlagNote {
  id: string;
  flagId: string;
  authorId: string;
  text: string;
  createdAt: Date;
}

export const FlagNoteEntity = new EntitySchema<FlagNote>({
  name: 'FlagNote',
  tableName: 'flag_notes',
  columns: {
    id: { type: 'bigint', primary: true, generated: 'increment' },
    flagId: { name: 'flag_id', type: 'uuid' },
    authorId: { name: 'author_id', type: 'uuid' },
    text: { type: 'text' },
    createdAt: { name: 'created_at', type: 'timestamptz', createDate: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [{ name: 'flag_notes_text_check', expression: '(length(btrim(text)) > 0)' }],
  indices: [{ name: 'flag_notes_flag', columns: ['flagId', 'createdAt'] }],
  foreignKeys: [
    { name: 'flag_notes_author_id_fkey', target: 'User', columnNames: ['author_id'], referencedColumnNames: ['id'] },
    { name: 'flag_notes_flag_id_fkey', target: 'Flag', columnNames: ['flag_id'], referencedColumnNames: ['id'] },
  ],
});
