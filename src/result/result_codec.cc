#include "result/result_codec.h"

#include <cstdint>
#include <cstring>

namespace zvsmap {
namespace {

constexpr uint8_t kFormat = 6;
// Upper bound for any count read back; a corrupt length must not make the
// decoder reserve gigabytes.
constexpr uint32_t kMaxCount = 1u << 24;

class Writer {
 public:
  void U8(uint8_t v) { out_.push_back(static_cast<char>(v)); }
  void U32(uint32_t v) { Raw(&v, sizeof v); }
  void U64(uint64_t v) { Raw(&v, sizeof v); }
  void I32(int32_t v) { Raw(&v, sizeof v); }
  void F64(double v) { Raw(&v, sizeof v); }
  void Str(const std::string& s) {
    U32(static_cast<uint32_t>(s.size()));
    out_.append(s);
  }
  std::string Take() { return std::move(out_); }

 private:
  void Raw(const void* p, size_t n) { out_.append(static_cast<const char*>(p), n); }
  std::string out_;
};

class Reader {
 public:
  explicit Reader(const std::string& in) : in_(in) {}
  bool U8(uint8_t* v) { return Raw(v, sizeof *v); }
  bool U32(uint32_t* v) { return Raw(v, sizeof *v); }
  bool U64(uint64_t* v) { return Raw(v, sizeof *v); }
  bool I32(int32_t* v) { return Raw(v, sizeof *v); }
  bool F64(double* v) { return Raw(v, sizeof *v); }
  bool Str(std::string* s) {
    uint32_t n = 0;
    if (!U32(&n) || n > in_.size() - pos_) return false;
    s->assign(in_, pos_, n);
    pos_ += n;
    return true;
  }
  bool AtEnd() const { return pos_ == in_.size(); }

 private:
  bool Raw(void* p, size_t n) {
    if (in_.size() - pos_ < n) return false;
    std::memcpy(p, in_.data() + pos_, n);
    pos_ += n;
    return true;
  }
  const std::string& in_;
  size_t pos_ = 0;
};

// beyond_tolerance: 0 false, 1 true, 2 empty.
void EncodeComparison(const Comparison& c, Writer* w) {
  w->Str(c.metric);
  w->Str(c.tag);
  w->F64(c.predicted);
  w->F64(c.difference);
  w->F64(c.relative_difference);
  w->U8(c.beyond_tolerance ? (*c.beyond_tolerance ? 1 : 0) : 2);
}

bool DecodeComparison(Reader* r, Comparison* c) {
  uint8_t beyond = 0;
  if (!r->Str(&c->metric) || !r->Str(&c->tag) || !r->F64(&c->predicted) ||
      !r->F64(&c->difference) || !r->F64(&c->relative_difference) || !r->U8(&beyond) ||
      beyond > 2) {
    return false;
  }
  if (beyond < 2) c->beyond_tolerance = beyond == 1;
  return true;
}

// The probe's v_ds(t_dead) curve: a count, then (t, v) pairs.
void EncodeCurve(const DeadTimeCurve& c, Writer* w) {
  w->U32(static_cast<uint32_t>(c.t_dead_s.size()));
  for (size_t k = 0; k < c.t_dead_s.size(); ++k) {
    w->F64(c.t_dead_s[k]);
    w->F64(k < c.v_ds_v.size() ? c.v_ds_v[k] : 0.0);
  }
}

bool DecodeCurve(Reader* r, DeadTimeCurve* c) {
  uint32_t n = 0;
  if (!r->U32(&n) || n > kMaxCount) return false;
  for (uint32_t k = 0; k < n; ++k) {  // no reserve: a corrupt count runs out of bytes first
    double t = 0, v = 0;
    if (!r->F64(&t) || !r->F64(&v)) return false;
    c->t_dead_s.push_back(t);
    c->v_ds_v.push_back(v);
  }
  return true;
}

bool DecodeEdge(Reader* r, EdgeMeasurement* e) {
  uint8_t zvs = 0;
  uint32_t metric_count = 0, comparison_count = 0;
  if (!r->Str(&e->cell) || !r->Str(&e->edge) || !r->U8(&zvs) ||
      zvs > static_cast<uint8_t>(ZvsClass::kUnknown) || !r->Str(&e->criterion) ||
      !r->U32(&metric_count) || metric_count > kMaxCount) {
    return false;
  }
  e->zvs = static_cast<ZvsClass>(zvs);
  for (uint32_t k = 0; k < metric_count; ++k) {
    Metric m;
    if (!r->Str(&m.column) || !r->F64(&m.value)) return false;
    e->metrics.push_back(std::move(m));
  }
  if (!r->U32(&comparison_count) || comparison_count > kMaxCount) return false;
  for (uint32_t k = 0; k < comparison_count; ++k) {
    Comparison c;
    if (!DecodeComparison(r, &c)) return false;
    e->comparisons.push_back(std::move(c));
  }
  return DecodeCurve(r, &e->probe_curve);
}

void EncodeOperatingPoint(const OperatingPoint& op, Writer* w) {
  w->U8(static_cast<uint8_t>(op.loop));
  for (double v : {op.control, op.set_point, op.regulated_avg, op.p_in_w, op.p_out_w}) w->F64(v);
  w->U32(static_cast<uint32_t>(op.averages.size()));
  for (const auto& a : op.averages) {
    w->Str(a.vector);
    w->F64(a.value);
  }
}

bool DecodeOperatingPoint(Reader* r, OperatingPoint* op) {
  uint8_t loop = 0;
  uint32_t count = 0;
  if (!r->U8(&loop) || loop > static_cast<uint8_t>(LoopKind::kRegulated)) return false;
  op->loop = static_cast<LoopKind>(loop);
  for (double* v : {&op->control, &op->set_point, &op->regulated_avg, &op->p_in_w, &op->p_out_w}) {
    if (!r->F64(v)) return false;
  }
  if (!r->U32(&count) || count > kMaxCount) return false;
  op->averages.clear();
  for (uint32_t k = 0; k < count; ++k) {
    VectorAverage a;
    if (!r->Str(&a.vector) || !r->F64(&a.value)) return false;
    op->averages.push_back(std::move(a));
  }
  return true;
}

}  // namespace

std::string EncodeResult(const PointResult& r) {
  Writer w;
  w.U8(kFormat);
  w.U64(r.index);
  w.U8(static_cast<uint8_t>(r.status));
  w.Str(r.reason);
  w.Str(r.log);
  w.U8(static_cast<uint8_t>(r.settle.method));
  w.I32(r.settle.iterations);
  w.F64(r.settle.periods);
  w.F64(r.settle.residual);
  w.U32(static_cast<uint32_t>(r.settle.initial_state.size()));
  for (const auto& state : r.settle.initial_state) {
    w.Str(state.init_param);
    w.F64(state.value);
  }
  w.F64(r.wall_s);
  w.U32(static_cast<uint32_t>(r.edges.size()));
  for (const auto& e : r.edges) {
    w.Str(e.cell);
    w.Str(e.edge);
    w.U8(static_cast<uint8_t>(e.zvs));
    w.Str(e.criterion);
    w.U32(static_cast<uint32_t>(e.metrics.size()));
    for (const auto& m : e.metrics) {
      w.Str(m.column);
      w.F64(m.value);
    }
    w.U32(static_cast<uint32_t>(e.comparisons.size()));
    for (const auto& c : e.comparisons) EncodeComparison(c, &w);
    EncodeCurve(e.probe_curve, &w);
  }
  w.Str(r.solver_aid);
  EncodeOperatingPoint(r.operating, &w);
  w.U32(static_cast<uint32_t>(r.settle.jacobian.size()));
  for (double v : r.settle.jacobian) w.F64(v);
  return w.Take();
}

bool DecodeResult(const std::string& data, PointResult* out) {
  Reader r(data);
  uint8_t format = 0, status = 0, method = 0;
  uint64_t index = 0;
  int32_t iterations = 0;
  double periods = 0;
  uint32_t edge_count = 0, state_count = 0;
  if (!r.U8(&format) || format != kFormat || !r.U64(&index) || !r.U8(&status) ||
      status > static_cast<uint8_t>(PointStatus::kNotRun) || !r.Str(&out->reason) ||
      !r.Str(&out->log) || !r.U8(&method) ||
      method > static_cast<uint8_t>(SettleMethod::kPeriods) || !r.I32(&iterations) ||
      !r.F64(&periods) || !r.F64(&out->settle.residual) || !r.U32(&state_count) ||
      state_count > kMaxCount) {
    return false;
  }
  out->settle.initial_state.clear();
  for (uint32_t i = 0; i < state_count; ++i) {
    SettledState state;
    if (!r.Str(&state.init_param) || !r.F64(&state.value)) return false;
    out->settle.initial_state.push_back(std::move(state));
  }
  if (!r.F64(&out->wall_s) || !r.U32(&edge_count) || edge_count > kMaxCount) return false;
  out->index = static_cast<size_t>(index);
  out->status = static_cast<PointStatus>(status);
  out->settle.method = static_cast<SettleMethod>(method);
  out->settle.iterations = iterations;
  out->settle.periods = periods;
  out->edges.clear();
  for (uint32_t i = 0; i < edge_count; ++i) {
    EdgeMeasurement e;
    if (!DecodeEdge(&r, &e)) return false;
    out->edges.push_back(std::move(e));
  }
  uint32_t jacobian_count = 0;
  if (!r.Str(&out->solver_aid) || !DecodeOperatingPoint(&r, &out->operating) ||
      !r.U32(&jacobian_count) || jacobian_count > kMaxCount) {
    return false;
  }
  out->settle.jacobian.assign(jacobian_count, 0.0);
  for (double& v : out->settle.jacobian)
    if (!r.F64(&v)) return false;
  return r.AtEnd();
}

}  // namespace zvsmap
