#include "verifier/syntax/large_stack.h"

#include <pthread.h>

#include <exception>

namespace thetagate::engine {

namespace {

struct Job {
  const std::function<void()>* work;
  std::exception_ptr error;
};

void* run_job(void* raw) {
  Job* job = static_cast<Job*>(raw);
  try {
    (*job->work)();
  } catch (...) {
    job->error = std::current_exception();
  }
  return nullptr;
}

}  // namespace

void run_on_large_stack(const std::function<void()>& work, size_t bytes) {
  Job job{&work, nullptr};
  pthread_attr_t attributes;
  bool started = false;
  pthread_t thread;
  if (pthread_attr_init(&attributes) == 0) {
    started = pthread_attr_setstacksize(&attributes, bytes) == 0 &&
              pthread_create(&thread, &attributes, run_job, &job) == 0;
    pthread_attr_destroy(&attributes);
  }
  if (!started) {
    work();
    return;
  }
  pthread_join(thread, nullptr);
  if (job.error) std::rethrow_exception(job.error);
}

}  // namespace thetagate::engine
