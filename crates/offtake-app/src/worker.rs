//! Background recomputation off the UI thread.
//!
//! The app sends a *snapshot* of the document (an owned clone) to one worker
//! thread; the thread runs the compute function on it and sends back the
//! output with the time it took. The UI thread never waits on it: each frame
//! it calls [`Worker::poll`], which dispatches a due request and collects a
//! finished one.
//!
//! Requests are **debounced**: [`Worker::request`] only records the newest
//! snapshot and a deadline; the snapshot is sent when no newer request has
//! arrived for the debounce interval and the thread is idle. While the thread
//! computes, newer requests wait, and only the newest is sent next, so a burst
//! of edits costs at most two computations.
//!
//! The compute function is any `FnMut(I) -> O + Send` closure: the app plugs
//! the offtake-core chain in (see [`crate::compute`]).

use std::sync::mpsc::{self, Receiver, RecvTimeoutError, Sender, TryRecvError};
use std::thread::JoinHandle;
use std::time::{Duration, Instant};

/// A finished computation.
#[derive(Debug, Clone, PartialEq)]
pub struct Finished<O> {
    /// Sequence number of the request that produced it (higher is newer).
    pub generation: u64,
    /// Wall time spent in the compute function (ms).
    pub elapsed_ms: f64,
    /// What the compute function returned.
    pub output: O,
}

/// Where the worker is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum WorkerState {
    /// Nothing waiting, nothing running.
    Idle,
    /// A request waits for its debounce deadline or for the thread.
    Waiting,
    /// The thread is computing.
    Running,
    /// The thread stopped (its compute function panicked).
    Stopped,
}

struct Job<I> {
    generation: u64,
    input: I,
}

/// A worker thread with a debounced request slot.
pub struct Worker<I, O> {
    jobs: Option<Sender<Job<I>>>,
    done: Receiver<Finished<O>>,
    thread: Option<JoinHandle<()>>,
    debounce: Duration,
    pending: Option<(Instant, u64, I)>,
    in_flight: Option<u64>,
    next_generation: u64,
    stopped: bool,
}

impl<I, O> std::fmt::Debug for Worker<I, O> {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("Worker")
            .field("debounce", &self.debounce)
            .field("pending", &self.pending.as_ref().map(|p| p.1))
            .field("in_flight", &self.in_flight)
            .field("stopped", &self.stopped)
            .finish_non_exhaustive()
    }
}

impl<I: Send + 'static, O: Send + 'static> Worker<I, O> {
    /// Starts the worker thread with `compute` and the debounce interval.
    ///
    /// # Panics
    /// Only if the operating system cannot start a thread.
    pub fn spawn(debounce: Duration, mut compute: impl FnMut(I) -> O + Send + 'static) -> Self {
        let (job_tx, job_rx) = mpsc::channel::<Job<I>>();
        let (done_tx, done_rx) = mpsc::channel::<Finished<O>>();
        let thread = std::thread::Builder::new()
            .name("offtake-recompute".to_owned())
            .spawn(move || {
                while let Ok(Job { generation, input }) = job_rx.recv() {
                    let start = Instant::now();
                    let output = compute(input);
                    let elapsed_ms = start.elapsed().as_secs_f64() * 1000.0;
                    let finished = Finished {
                        generation,
                        elapsed_ms,
                        output,
                    };
                    if done_tx.send(finished).is_err() {
                        break;
                    }
                }
            })
            .expect("the operating system could not start the recompute thread");
        Self {
            jobs: Some(job_tx),
            done: done_rx,
            thread: Some(thread),
            debounce,
            pending: None,
            in_flight: None,
            next_generation: 1,
            stopped: false,
        }
    }

    /// Records `input` as the newest request; it is sent after the debounce
    /// interval has passed without a newer request. Returns its generation.
    pub fn request(&mut self, input: I, now: Instant) -> u64 {
        let generation = self.next_generation;
        self.next_generation += 1;
        self.pending = Some((now + self.debounce, generation, input));
        generation
    }

    /// Dispatches a due request and collects a finished computation, without blocking.
    pub fn poll(&mut self, now: Instant) -> Option<Finished<O>> {
        let finished = self.collect();
        self.dispatch_if_due(now);
        finished
    }

    /// Blocks until the running or waiting request finishes, at most `timeout`;
    /// ignores the debounce deadline. For tests and batch use, never in a frame.
    pub fn wait(&mut self, timeout: Duration) -> Option<Finished<O>> {
        let end = Instant::now() + timeout;
        let mut last = None;
        loop {
            if let Some(f) = self.collect() {
                last = Some(f);
            }
            if self.in_flight.is_none() {
                if let Some((_, generation, input)) = self.pending.take() {
                    self.send(generation, input);
                } else {
                    return last;
                }
            }
            let now = Instant::now();
            if now >= end || self.stopped {
                return last;
            }
            match self.done.recv_timeout(end - now) {
                Ok(f) => {
                    self.in_flight = None;
                    last = Some(f);
                }
                Err(RecvTimeoutError::Timeout) => return last,
                Err(RecvTimeoutError::Disconnected) => {
                    self.mark_stopped();
                    return last;
                }
            }
        }
    }

    /// Where the worker is.
    pub fn state(&self) -> WorkerState {
        if self.stopped {
            WorkerState::Stopped
        } else if self.in_flight.is_some() {
            WorkerState::Running
        } else if self.pending.is_some() {
            WorkerState::Waiting
        } else {
            WorkerState::Idle
        }
    }

    /// How long until the UI should poll again (`None` when idle).
    pub fn next_poll_in(&self, now: Instant) -> Option<Duration> {
        if self.stopped {
            return None;
        }
        if self.in_flight.is_some() {
            return Some(Duration::from_millis(15));
        }
        self.pending
            .as_ref()
            .map(|(due, _, _)| due.saturating_duration_since(now))
    }

    fn collect(&mut self) -> Option<Finished<O>> {
        let mut newest = None;
        loop {
            match self.done.try_recv() {
                Ok(f) => {
                    self.in_flight = None;
                    newest = Some(f);
                }
                Err(TryRecvError::Empty) => return newest,
                Err(TryRecvError::Disconnected) => {
                    self.mark_stopped();
                    return newest;
                }
            }
        }
    }

    fn dispatch_if_due(&mut self, now: Instant) {
        if self.in_flight.is_some() || self.stopped {
            return;
        }
        if self.pending.as_ref().is_some_and(|(due, _, _)| *due <= now)
            && let Some((_, generation, input)) = self.pending.take()
        {
            self.send(generation, input);
        }
    }

    fn send(&mut self, generation: u64, input: I) {
        let sent = self
            .jobs
            .as_ref()
            .is_some_and(|jobs| jobs.send(Job { generation, input }).is_ok());
        if sent {
            self.in_flight = Some(generation);
        } else {
            self.mark_stopped();
        }
    }

    fn mark_stopped(&mut self) {
        self.stopped = true;
        self.in_flight = None;
        self.pending = None;
    }
}

impl<I, O> Drop for Worker<I, O> {
    fn drop(&mut self) {
        // Closing the job channel ends the thread's loop after its current job.
        self.jobs = None;
        if let Some(thread) = self.thread.take() {
            // A panic inside the compute function was already reported as `Stopped`.
            let _ = thread.join();
        }
    }
}

#[cfg(test)]
mod tests {
    use super::{Worker, WorkerState};
    use std::time::{Duration, Instant};

    #[test]
    fn computes_off_thread_and_reports_generation() {
        let mut w = Worker::spawn(Duration::ZERO, |v: Vec<u32>| v.iter().sum::<u32>());
        assert_eq!(w.state(), WorkerState::Idle);
        let g = w.request(vec![1, 2, 3], Instant::now());
        let done = w.wait(Duration::from_secs(10)).expect("result");
        assert_eq!(done.generation, g);
        assert_eq!(done.output, 6);
        assert!(done.elapsed_ms >= 0.0);
        assert_eq!(w.state(), WorkerState::Idle);
    }

    #[test]
    fn debounce_keeps_only_the_newest_request() {
        let mut w = Worker::spawn(Duration::from_hours(1), |v: u32| v * 10);
        let t0 = Instant::now();
        w.request(1, t0);
        w.request(2, t0);
        let g3 = w.request(3, t0);
        // Not due yet: polling sends nothing.
        assert!(w.poll(t0).is_none());
        assert_eq!(w.state(), WorkerState::Waiting);
        assert!(w.next_poll_in(t0).expect("pending") > Duration::from_mins(50));
        // `wait` ignores the deadline and sends only the newest snapshot.
        let done = w.wait(Duration::from_secs(10)).expect("result");
        assert_eq!((done.generation, done.output), (g3, 30));
    }

    #[test]
    fn poll_dispatches_when_due() {
        let mut w = Worker::spawn(Duration::from_millis(5), |v: u32| v + 1);
        let t0 = Instant::now();
        w.request(41, t0);
        assert!(w.poll(t0 + Duration::from_millis(6)).is_none());
        assert_eq!(w.state(), WorkerState::Running);
        let done = w.wait(Duration::from_secs(10)).expect("result");
        assert_eq!(done.output, 42);
    }

    #[test]
    fn panicking_compute_stops_the_worker_without_hanging() {
        let mut w = Worker::spawn(Duration::ZERO, |v: u32| -> u32 {
            assert!(v != 0, "test panic in compute");
            v
        });
        w.request(0, Instant::now());
        assert!(w.wait(Duration::from_secs(10)).is_none());
        assert_eq!(w.state(), WorkerState::Stopped);
    }
}
