import { z } from 'zod';
import { calendarDate } from '../calendar-date';
import { blankAsAbsent, blankAsNull } from './typed-input';

/** What a photo shows; "measurement" means a ruler or scale is in view. */
export const photoSubjects = ['plant', 'fruit', 'leaf', 'damage', 'measurement'] as const;
export type PhotoSubject = (typeof photoSubjects)[number];

export const photoSubjectLabels: Record<PhotoSubject, string> = {
  plant: 'Whole plant',
  fruit: 'Pod or fruit',
  leaf: 'Leaf',
  damage: 'Damage or disease',
  measurement: 'Measurement (scale in view)',
};

export const photoVariants = ['thumb', 'display', 'original'] as const;
export type PhotoVariant = (typeof photoVariants)[number];

/** The long edge of each served size, in pixels; the original keeps its own size. */
export const PHOTO_THUMB_EDGE = 400;
export const PHOTO_DISPLAY_EDGE = 1600;

/** The upload limits; the server enforces them and sends them to the client to show. */
export const photoLimitsSchema = z.object({
  maxBytes: z.number().int(),
  maxFiles: z.number().int(),
  maxPixels: z.number().int(),
  acceptedTypes: z.array(z.string()),
  heicReadable: z.boolean(),
});
export type PhotoLimits = z.infer<typeof photoLimitsSchema>;

const isoDate = calendarDate();
const caption = z
  .string()
  .trim()
  .min(1, 'Describe the photo: the caption is what people hear when they cannot see it.')
  .max(300, 'Keep the caption to 300 characters.');

export const photoParams = z.object({
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
  photoId: z.uuid('Not a photo id.'),
});
export const photoVariantParams = photoParams.extend({ variant: z.enum(photoVariants) });

/** Multipart text fields sent with each upload (they arrive as strings). */
const emptyToUndefined = (v: unknown) => (v === '' || v === 'null' ? undefined : v);
export const uploadPhotoFields = z.object({
  caption,
  entryId: z.preprocess(emptyToUndefined, z.uuid('Choose an entry from the list.').optional()),
  plotId: z.preprocess(emptyToUndefined, z.uuid('Choose a plot from the list.').optional()),
  /** Left empty, the photo's own capture date is used, else the upload day. */
  takenOn: z.preprocess(emptyToUndefined, isoDate.optional()),
  subject: z.preprocess(emptyToUndefined, z.enum(photoSubjects).optional()),
  /** The uploader's calendar day, for photos without a capture date. */
  today: z.preprocess(emptyToUndefined, isoDate.optional()),
  /**
   * Made on the device once per upload and sent again with every retry: a retry whose first
   * answer was lost gets the photos the first attempt made, never a second copy.
   */
  uploadId: z.preprocess(emptyToUndefined, z.uuid('Not an upload id.').optional()),
});
export type UploadPhotoFields = z.input<typeof uploadPhotoFields>;

export const updatePhotoBody = z
  .object({
    caption: caption.optional(),
    entryId: z.uuid('Choose an entry from the list.').nullable().optional(),
    plotId: z.uuid('Choose a plot from the list.').nullable().optional(),
    takenOn: isoDate.optional(),
    subject: z.enum(photoSubjects).nullable().optional(),
  })
  .strict();
export type UpdatePhotoBody = z.infer<typeof updatePhotoBody>;

/**
 * The tag fields of the upload and edit forms, as typed (text; blank for "not said"). The
 * output is an edit's body; an upload sends the same values as multipart text.
 */
export const photoTagForm = z.object({
  caption,
  entryId: blankAsNull(z.uuid('Choose an entry from the list.').nullable()),
  plotId: blankAsNull(z.uuid('Choose a plot from the list.').nullable()),
  takenOn: blankAsAbsent(isoDate.optional()),
  subject: blankAsNull(z.enum(photoSubjects).nullable()),
});
/** The caption typed beside "Add photo" in the field log; the rest is the plot in hand. */
export const plotPhotoForm = photoTagForm.pick({ caption: true });
/** What the tag fields hold while a person types. */
export interface PhotoTagText {
  caption: string;
  entryId: string;
  plotId: string;
  takenOn: string;
  subject: PhotoSubject | '';
}

export const listPhotosQuery = z.object({
  entryId: z.uuid().optional(),
  plotId: z.uuid().optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  subject: z.enum(photoSubjects).optional(),
});
export type ListPhotosQuery = z.infer<typeof listPhotosQuery>;

export const photoSchema = z.object({
  id: z.uuid(),
  entryId: z.uuid().nullable(),
  plotId: z.uuid().nullable(),
  takenOn: z.string().nullable(),
  capturedAt: z.string().nullable(),
  caption: z.string(),
  subject: z.enum(photoSubjects).nullable(),
  mimeType: z.string(),
  width: z.number().int().nullable(),
  height: z.number().int().nullable(),
  bytes: z.number().int().nullable(),
  thumbWidth: z.number().int().nullable(),
  thumbHeight: z.number().int().nullable(),
  displayWidth: z.number().int().nullable(),
  displayHeight: z.number().int().nullable(),
  isCover: z.boolean(),
  uploadedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  createdAt: z.string(),
  deletedAt: z.string().nullable(),
  /** Tags may be changed and the photo deleted by its uploader and the lead. */
  canEdit: z.boolean(),
  urls: z.object({
    thumb: z.string(),
    display: z.string(),
    /** Only for the uploader and the lead. */
    original: z.string().nullable(),
  }),
});
export type Photo = z.infer<typeof photoSchema>;

export const photoListSchema = z.object({ photos: z.array(photoSchema) });
export const uploadPhotoResponse = z.object({ photos: z.array(photoSchema) });
export const photoResponse = z.object({ photo: photoSchema });
export const deletePhotoResponse = z.object({
  photo: photoSchema,
  /** Until then the deletion can be undone; afterwards the files are removed. */
  undoUntil: z.string(),
});

/** Entries and plots to tag with, what the caller may do, and the limits. */
export const photoTaggingSchema = z.object({
  entries: z.array(
    z.object({
      id: z.uuid(),
      code: z.string(),
      name: z.string(),
      coverPhotoId: z.uuid().nullable(),
    }),
  ),
  plots: z.array(
    z.object({
      id: z.uuid(),
      entryId: z.uuid(),
      siteId: z.uuid(),
      siteName: z.string(),
      plotNumber: z.number().int(),
      block: z.number().int(),
    }),
  ),
  permissions: z.object({ upload: z.boolean(), chooseCover: z.boolean() }),
  limits: photoLimitsSchema,
});
export type PhotoTagging = z.infer<typeof photoTaggingSchema>;
