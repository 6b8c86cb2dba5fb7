// Loaded with `--import` into a spawned server: on SIGUSR2, a promise rejection that no code handles,
// to show what the process does with one.
process.on('SIGUSR2', () => {
  void Promise.reject(new Error('escaped every handler (test)'));
});
