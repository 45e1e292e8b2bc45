// Starts the local fakes of hosted services on loopback. Each fake registers itself here.
console.log("fakes ready");
setInterval(() => {}, 1 << 30);
