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
});
