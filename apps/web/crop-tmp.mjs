import { Jimp } from "jimp";
const [,, src, dst, y, h] = process.argv;
const img = await Jimp.read(src);
const height = Math.min(Number(h), img.bitmap.height - Number(y));
img.crop({ x: 0, y: Number(y), w: img.bitmap.width, h: height });
await img.write(dst);
console.log(img.bitmap.width, img.bitmap.height);
