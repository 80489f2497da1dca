import sharp from 'sharp';
import { AppError } from '../errors/app-error';
import { sniffImageType, type ImageType } from './image-type';

// Every uploaded photo is decoded and written anew before it is stored, so what Fieldfold keeps and serves is
// an image sharp made, never the sender's bytes:
// - turned upright by its EXIF orientation, then every piece of metadata dropped (EXIF with the phone's GPS
//   position and serial numbers, XMP, IPTC, comments, ICC profiles): sharp writes none unless asked;
// - fitted within 2048 px on its long edge (a phone's 12–48 MP photo is 2–8 MB; 2048 px shows a paddock well);
// - the same type as it came (JPEG, PNG or WebP); only the first frame of an animation is kept.
// Decoding is bounded: a file that claims more than MAX_INPUT_PIXELS (a "decompression bomb", a few kB
// of PNG that would unpack to gigabytes) is refused from its header before any pixel is decoded, and the
// whole re-encode is given a time limit.

export const MAX_PHOTO_EDGE_PX = 2048;
/** 50 megapixels: the largest phone cameras (48 MP, 8064 × 6048) pass; beyond it, the header alone refuses it. */
export const MAX_INPUT_PIXELS = 50_000_000;
const REENCODE_TIMEOUT_S = 20;

export interface ReencodedPhoto {
  bytes: Buffer;
  type: ImageType;
  width: number;
  height: number;
}

/** `field` names the form field in the 4xx a bad file gets. */
export async function reencodePhoto(input: Buffer, field: string): Promise<ReencodedPhoto> {
  const type = sniffImageType(input);
  if (!type) {
    throw new AppError(415, 'unsupported_type', 'Photos must be JPEG, PNG or WebP images', {
      [field]: 'This file is not a JPEG, PNG or WebP image (checked by its content, not its name)',
    });
  }
  const image = sharp(input, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error', pages: 1 })
    .rotate()
    .resize({ width: MAX_PHOTO_EDGE_PX, height: MAX_PHOTO_EDGE_PX, fit: 'inside', withoutEnlargement: true })
    .timeout({ seconds: REENCODE_TIMEOUT_S });
  const encoded = type === 'image/jpeg' ? image.jpeg({ quality: 82, mozjpeg: true }) : type === 'image/png' ? image.png({ compressionLevel: 9, effort: 4 }) : image.webp({ quality: 82 });
  try {
    const { data, info } = await encoded.toBuffer({ resolveWithObject: true });
    return { bytes: data, type, width: info.width, height: info.height };
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    if (/pixel limit/i.test(message)) {
      throw new AppError(413, 'too_large', `Photos may have at most ${MAX_INPUT_PIXELS / 1_000_000} megapixels`, {
        [field]: `This image has more than ${MAX_INPUT_PIXELS / 1_000_000} megapixels`,
      });
    }
    throw new AppError(415, 'unsupported_type', 'The photo could not be read as an image', {
      [field]: 'This file could not be read as a JPEG, PNG or WebP image; it may be damaged',
    });
  }
}
