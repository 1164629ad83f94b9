// AudioWorklet processor: copies the microphone's first channel (or the mean of all channels)
// to the main thread in blocks of 2048 samples, with each block's peak so the level meter and
// the clipping warning need no second pass. Plain JS: worklets load as their own script file
// (the server's Content-Security-Policy allows same-origin scripts, not blob: ones).
class TinelogCapture extends AudioWorkletProcessor {
  constructor() {
    super();
    this.block = new Float32Array(2048);
    this.filled = 0;
  }

  process(inputs) {
    const input = inputs[0];
    if (!input || input.length === 0) return true;
    const frames = input[0].length;
    for (let i = 0; i < frames; i++) {
      let v = 0;
      for (let c = 0; c < input.length; c++) v += input[c][i];
      this.block[this.filled++] = v / input.length;
      if (this.filled === this.block.length) {
        let peak = 0;
        let sumSq = 0;
        for (let k = 0; k < this.block.length; k++) {
          const a = Math.abs(this.block[k]);
          if (a > peak) peak = a;
          sumSq += this.block[k] * this.block[k];
        }
        const samples = this.block;
        this.port.postMessage({ samples, peak, rms: Math.sqrt(sumSq / samples.length) }, [samples.buffer]);
        this.block = new Float32Array(2048);
        this.filled = 0;
      }
    }
    return true;
  }
}

registerProcessor("tinelog-capture", TinelogCapture);
