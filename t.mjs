import sharp from 'sharp';
import { PNG } from 'pngjs';
const raw = Buffer.from([200,100,50, 60,180,120]);
const p3 = await sharp(raw,{raw:{width:2,height:1,channels:3}}).withIccProfile('p3').png().toBuffer();
console.log('stored', PNG.sync.read(p3).data);
const dflt = await sharp(p3).raw().toBuffer(); console.log('default read', dflt);
const ws = await sharp(p3).withIccProfile('srgb').raw().toBuffer(); console.log('withIcc srgb read', ws);
// 16-bit read
const r16 = await sharp(p3).toColourspace('rgb16').raw({depth:'ushort'}).toBuffer(); console.log('rgb16', new Uint16Array(r16.buffer,r16.byteOffset,6));
const f = await sharp(p3).pipelineColourspace('rgb16').toColourspace('rgb16').raw({depth:'ushort'}).toBuffer(); console.log('pipe rgb16', new Uint16Array(f.buffer,f.byteOffset,6));
